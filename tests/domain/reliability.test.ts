import { describe, expect, it } from 'vitest';
import { mergeSpans, reliabilityFigures } from '../../shared/domain/reliability';

// Definitions: IEC 60050-192:2015 (MTBF = mean operating time between failures; MTTR = mean time to
// restoration) and EN 13306:2017 (availability, operating time); entry numbers from memory.
// Every expected figure below is worked by hand in the comment beside it.
describe('reliabilityFigures', () => {
  const from = '2027-01-01T00:00:00Z';
  const to = '2027-01-11T00:00:00Z'; // 10 days = 240 h

  it('clips a stop begun before the window, merges two overlapping failures into one, keeps planned time apart', () => {
    const f = reliabilityFigures({
      from,
      to,
      downtimes: [
        // began 4 h before the window: 4 h of it count (00:00–04:00)
        { start: '2026-12-31T20:00:00Z', end: '2027-01-01T04:00:00Z', kind: 'failure' },
        // two records of one stop, 10:00–14:00 and 12:00–16:00: one failure of 6 h
        { start: '2027-01-03T10:00:00Z', end: '2027-01-03T14:00:00Z', kind: 'failure' },
        { start: '2027-01-03T12:00:00Z', end: '2027-01-03T16:00:00Z', kind: 'failure' },
        // planned 8 h
        { start: '2027-01-05T08:00:00Z', end: '2027-01-05T16:00:00Z', kind: 'planned' },
        // runs past the window's end: 2 h of it count (22:00–24:00)
        { start: '2027-01-10T22:00:00Z', end: '2027-01-11T03:00:00Z', kind: 'failure' },
        // wholly outside: ignored
        { start: '2027-01-20T00:00:00Z', end: '2027-01-20T05:00:00Z', kind: 'failure' },
      ],
    });
    // failures: 3; failure downtime 4 + 6 + 2 = 12 h; planned 8 h; operating 240 − 20 = 220 h
    expect(f.failures).toBe(3);
    expect(f.failureDowntimeHours).toBe(12);
    expect(f.plannedDowntimeHours).toBe(8);
    expect(f.operatingHours).toBe(220);
    // IEC 60050-192 MTBF: 220 h / 3 = 73.333 h
    expect(f.mtbfHours).toBeCloseTo(73.3333, 4);
    // IEC 60050-192 MTTR: 12 h / 3 = 4 h
    expect(f.mttrHours).toBe(4);
    // EN 13306 availability: 220 / (240 − 8) = 0.948276
    expect(f.availability).toBeCloseTo(0.948276, 6);
  });

  it('counts time a failure and a planned stop overlap once in the operating time', () => {
    // window 100 h; failure 10–20 h, planned 15–30 h → down 10–30 = 20 h, operating 80 h
    const at = (h: number) => new Date(Date.UTC(2027, 5, 1) + h * 3_600_000);
    const f = reliabilityFigures({
      from: at(0),
      to: at(100),
      downtimes: [
        { start: at(10), end: at(20), kind: 'failure' },
        { start: at(15), end: at(30), kind: 'planned' },
      ],
    });
    expect(f.operatingHours).toBe(80);
    expect(f.mtbfHours).toBe(80); // 80 h / 1
    expect(f.mttrHours).toBe(10); // 10 h / 1
    expect(f.availability).toBeCloseTo(80 / 85, 10); // 80 / (100 − 15) = 0.941176
  });

  it('runs an open stop to the window end, and has no MTBF or MTTR without failures', () => {
    const open = reliabilityFigures({ from, to, downtimes: [{ start: '2027-01-10T00:00:00Z', end: null, kind: 'failure' }] });
    expect(open.failureDowntimeHours).toBe(24);
    expect(open.operatingHours).toBe(216);
    const none = reliabilityFigures({ from, to, downtimes: [] });
    expect(none).toMatchObject({ failures: 0, operatingHours: 240, mtbfHours: null, mttrHours: null, availability: 1 });
    // All planned: nothing was meant to run, so no availability.
    expect(reliabilityFigures({ from, to, downtimes: [{ start: from, end: to, kind: 'planned' }] }).availability).toBeNull();
  });

  it('joins touching records of the same kind into one stop', () => {
    expect(
      mergeSpans([
        [5, 8],
        [0, 5],
        [9, 10],
      ]),
    ).toEqual([
      [0, 8],
      [9, 10],
    ]);
  });

  it('refuses a window that ends before it starts and a stop that ends before it starts', () => {
    expect(() => reliabilityFigures({ from: to, to: from, downtimes: [] })).toThrow(/window must end after it starts/);
    expect(() => reliabilityFigures({ from, to, downtimes: [{ start: '2027-01-02T00:00:00Z', end: '2027-01-01T00:00:00Z', kind: 'failure' }] })).toThrow(
      /Stop 1 ends before it starts/,
    );
    expect(() => reliabilityFigures({ from: 'soon', to, downtimes: [] })).toThrow(/not a valid date/);
  });
});
