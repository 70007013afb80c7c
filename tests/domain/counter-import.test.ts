import { describe, it, expect } from 'vitest';
import { importKeySource, mapHeader, parseReadAt, parseRow, templateCsv } from '../../shared/domain/counter-import';

// Kerfbook's own CSV layout (docs/counter-import.md); times per ISO 8601 / RFC 3339.
describe('mapHeader', () => {
  it('reads the columns in any order and case, ignoring a byte-order mark', () => {
    const { map, problems } = mapHeader(['\uFEFFValue', 'READ_AT', 'meter_code', 'machine_code', 'reset']);
    expect(problems).toEqual([]);
    expect(map).toEqual({ value: 0, read_at: 1, meter_code: 2, machine_code: 3, reset: 4 });
  });
  it('names missing, unknown and repeated columns', () => {
    expect(mapHeader(['machine_code', 'value', 'value', 'when']).problems).toEqual(['Missing columns “meter_code”, “read_at”', 'Column “value” appears twice', 'Unknown column “when”']);
  });
});

describe('parseReadAt', () => {
  it('takes an offset as written', () => {
    expect(parseReadAt('2026-03-14T07:30:00Z', 'America/Chicago')!.toISOString()).toBe('2026-03-14T07:30:00.000Z');
    expect(parseReadAt('2026-03-14T07:30:00+01:00', 'America/Chicago')!.toISOString()).toBe('2026-03-14T06:30:00.000Z');
  });
  it("reads a time without offset in the shop's zone, across the DST change (IANA tz database)", () => {
    // America/Chicago: CST (UTC−6) until 2026-03-08 02:00, then CDT (UTC−5).
    expect(parseReadAt('2026-03-07 07:30', 'America/Chicago')!.toISOString()).toBe('2026-03-07T13:30:00.000Z');
    expect(parseReadAt('2026-03-14 07:30', 'America/Chicago')!.toISOString()).toBe('2026-03-14T12:30:00.000Z');
  });
  it('refuses other shapes', () => {
    for (const s of ['14/03/2026', '2026-13-01 07:00', 'yesterday', '']) expect(parseReadAt(s, 'UTC')).toBeNull();
  });
});

describe('parseRow', () => {
  const map = mapHeader(['machine_code', 'meter_code', 'read_at', 'value', 'reset']).map;
  const now = new Date('2026-06-01T00:00:00Z');
  it('parses a good row', () => {
    expect(parseRow(['C1-T', 'arc-starts', '2026-03-14T07:30:00Z', '184220', 'yes'], map, 2, 'UTC', now)).toEqual({
      line: 2, machineCode: 'C1-T', meterCode: 'arc-starts', readAt: new Date('2026-03-14T07:30:00Z'), value: 184220, reset: true, unit: null,
    });
  });
  it('lists every problem of a bad row with its column', () => {
    const res = parseRow(['', 'arc-starts', '2026-07-01T00:00:00Z', '1,5', 'perhaps'], map, 9, 'UTC', now);
    expect(res).toEqual([
      { line: 9, column: 'machine_code', message: 'Machine code is empty' },
      { line: 9, column: 'read_at', message: '2026-07-01T00:00:00Z lies in the future' },
      { line: 9, column: 'value', message: '“1,5” is not a number; use digits with a point for decimals, no thousands separators' },
      { line: 9, column: 'reset', message: '“perhaps” is not yes or no' },
    ]);
  });
  it('flags a row with a different number of fields than the header', () => {
    const res = parseRow(['C1-T', 'arc-starts', '2026-03-14T07:30:00Z', '5', 'no', 'extra'], map, 3, 'UTC', now);
    expect(res).toEqual([{ line: 3, column: null, message: 'Has 6 fields, the header has 5' }]);
  });
});

describe('import keys and template', () => {
  it('gives the same reading the same key whatever file it comes from', () => {
    expect(importKeySource('m1', new Date('2026-03-14T07:30:00+00:00'), 5, false)).toBe(importKeySource('m1', new Date('2026-03-14T01:30:00-06:00'), 5, false));
    expect(importKeySource('m1', new Date('2026-03-14T07:30:00Z'), 5, true)).not.toBe(importKeySource('m1', new Date('2026-03-14T07:30:00Z'), 5, false));
  });
  it('writes a template the parser reads back', () => {
    const csv = templateCsv([{ machineCode: 'C1-T', meterCode: 'arc-starts', unit: 'starts', value: 10 }]).trim().split('\r\n');
    const { map, problems } = mapHeader(csv[0].split(','));
    expect(problems).toEqual([]);
    expect(parseRow(csv[1].split(','), map, 2, 'UTC', new Date('2027-01-01T00:00:00Z'))).toMatchObject({ machineCode: 'C1-T', value: 10, reset: false, unit: 'starts' });
  });
});
