export const MACHINE_KINDS = ['punch-plasma-cell', 'plasma-table', 'press-brake', 'hydraulic-unit', 'fume-extractor', 'torch', 'punch-head', 'other'] as const;
export type MachineKind = (typeof MACHINE_KINDS)[number];
export const MACHINE_KIND_LABELS: Record<MachineKind, string> = {
  'punch-plasma-cell': 'Punch/plasma cell',
  'plasma-table': 'Plasma table',
  'press-brake': 'Press brake',
  'hydraulic-unit': 'Hydraulic unit',
  'fume-extractor': 'Fume extractor',
  torch: 'Plasma torch',
  'punch-head': 'Punch head',
  other: 'Other',
};

/** Meter kinds: counts and running time only go up (unless reset); condition readings move both ways. */
export const METER_KINDS = ['count', 'running-time', 'condition'] as const;
export type MeterKind = (typeof METER_KINDS)[number];

/** Units a meter may use, by kind. Stored with every meter and shown beside every value. */
export const METER_UNITS: Record<MeterKind, readonly string[]> = {
  count: ['starts', 'hits', 'cycles'],
  'running-time': ['h'],
  condition: ['Pa', 'kPa', 'bar', '°C', 'mm'],
};
