import { describe, it, expect } from 'vitest';
import { DateTime } from 'luxon';
import { importKeySource, mapHeader, parseReadAt, parseRow, templateCsv } from '../../shared/domain/counter-import';

// Kerfbook's own CSV layout (docs/counter-import.md); times per ISO 8601 / RFC 3339.
describe('mapHeader', () => {
  it('reads the columns in any order and case, ignoring a byte-order mark', () => {
    const { map, problems } = mapHeader(['\uFEFFValue', 'READ_AT', 'meter_code', 'machine_code', 'reset']);
    expect(problems).toEqual([]);
    expect(map).toEqual({ value: 0, read_at: 1, meter_code: 2, machine_code: 3, reset: 4 });
  });
  it('names missing, unknown and repeated columns', () => {
    expect(mapHeader(['machine_code', 'value', 'value', 'when']).problems).toEqual([
      'Missing columns “meter_code”, “read_at”',
      'Column “value” appears twice',
      'Unknown column “when”',
    ]);
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
      line: 2,
      machineCode: 'C1-T',
      meterCode: 'arc-starts',
      readAt: new Date('2026-03-14T07:30:00Z'),
      value: 184220,
      reset: true,
      unit: null,
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
    const csv = templateCsv([{ machineCode: 'C1-T', meterCode: 'arc-starts', unit: 'starts', value: 10 }])
      .trim()
      .split('\r\n');
    const { map, problems } = mapHeader(csv[0].split(','));
    expect(problems).toEqual([]);
    expect(parseRow(csv[1].split(','), map, 2, 'UTC', new Date('2027-01-01T00:00:00Z'))).toMatchObject({
      machineCode: 'C1-T',
      value: 10,
      reset: false,
      unit: 'starts',
    });
  });
});

describe('parseReadAt on plain ISO times with an offset', () => {
  // Reference: luxon's own ISO 8601 reader (DateTime.fromISO with setZone), which the
  // short path must agree with on every value and every refusal.
  const byLuxon = (s: string) => {
    const dt = DateTime.fromISO(s, { setZone: true });
    return dt.isValid ? dt.toJSDate().toISOString() : null;
  };
  it('agrees with luxon on valid and invalid dates, times, fractions and offsets', () => {
    const cases: string[] = [];
    for (const date of [
      '2026-01-31',
      '2026-02-28',
      '2026-02-29',
      '2024-02-29',
      '2026-04-31',
      '2026-00-10',
      '2026-13-01',
      '2026-06-00',
      '2026-12-32',
      '1970-01-01',
      '1969-12-31',
      '0099-05-05',
    ])
      for (const time of ['00:00', '07:30', '23:59:59', '24:00:00', '12:60', '12:30:60', '07:30:00.5', '07:30:00.05', '07:30:00.999', '07:30:00.1234'])
        for (const zone of ['Z', '+00:00', '-00:30', '+05:45', '-06:00', '+14:00', '+23:59', '+24:00', '-05:75']) cases.push(`${date}T${time}${zone}`);
    expect(cases.length).toBe(12 * 10 * 9);
    for (const s of cases) expect(parseReadAt(s, 'America/Chicago')?.toISOString() ?? null, s).toBe(byLuxon(s));
  });

  it('reads the whole-second UTC shape digit by digit as luxon does, and leaves look-alikes to the full reader', () => {
    const cases = [
      '2026-03-14T07:30:00Z',
      '1999-12-31T23:59:59Z',
      '2026-03-1aT07:30:00Z',
      '2026-03-14T07:3x:00Z',
      '2026-03-14t07:30:00Z',
      '2026-03-14T07:30:00z',
      '2026/03/14T07:30:00Z',
      '2026-03-14T07:30:0０Z', // a full-width digit is not a digit
      '+026-03-14T07:30:00Z',
    ];
    for (const s of cases) expect(parseReadAt(s, 'America/Chicago')?.toISOString() ?? null, s).toBe(byLuxon(s));
    expect(parseReadAt('1999-12-31T23:59:59Z', 'UTC')!.toISOString()).toBe('1999-12-31T23:59:59.000Z');
  });
});
