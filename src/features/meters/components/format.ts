import type { MeterRow } from '../../../../shared/schemas/machines';

const int = new Intl.NumberFormat(undefined, { maximumFractionDigits: 0 });
const dec = new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 });

/** A value with its unit, always: a bare number on a shop floor is an invitation to guess. */
export function formatValue(value: number, unit: string): string {
  const n = unit === 'h' || unit === 'mm' || unit === 'bar' || unit === 'kPa' || unit === '°C' ? dec.format(value) : int.format(value);
  return `${n} ${unit}`;
}

/** 'Above the upper limit' / 'Below the lower limit' for condition meters, else null. */
export function limitState(m: Pick<MeterRow, 'lowerLimit' | 'upperLimit' | 'unit'>, value: number): string | null {
  if (m.upperLimit !== null && value > m.upperLimit) return `Above limit ${formatValue(m.upperLimit, m.unit)}`;
  if (m.lowerLimit !== null && value < m.lowerLimit) return `Below limit ${formatValue(m.lowerLimit, m.unit)}`;
  return null;
}
