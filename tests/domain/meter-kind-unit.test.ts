import { describe, expect, it } from 'vitest';
import { METER_UNITS, meterInputSchema, unitForKind } from '../../shared/schemas/machines';

// The meter form's unit after a change of kind must be one the schema accepts for that kind.
describe('unit offered when a meter kind is chosen', () => {
  it('running time counts in hours: a count unit left over from the default is replaced', () => {
    expect(unitForKind('running-time', 'starts')).toBe('h');
    expect(unitForKind('condition', 'starts')).toBe(METER_UNITS.condition[0]);
    expect(unitForKind('count', 'h')).toBe('starts');
  });

  it('keeps a unit the new kind allows', () => {
    expect(unitForKind('count', 'hits')).toBe('hits');
    expect(unitForKind('condition', 'bar')).toBe('bar');
  });

  it('every kind with its chosen unit passes the form schema', () => {
    for (const kind of ['count', 'running-time', 'condition'] as const) {
      const parsed = meterInputSchema.safeParse({
        machineId: '00000000-0000-4000-8000-000000000001',
        code: 'run-hours',
        name: 'Run hours',
        kind,
        unit: unitForKind(kind, 'starts'),
      });
      expect(parsed.success, `${kind}: ${JSON.stringify(parsed.error?.issues)}`).toBe(true);
    }
  });
});
