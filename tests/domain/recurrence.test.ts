import { describe, expect, it } from 'vitest';
import {
  buildRecurrenceText,
  expandRecurrence,
  localToInstant,
  parseRecurrence,
  previousOccurrence,
  RecurrenceError,
  validateRecurrence,
} from '../../shared/domain/recurrence';
import { RRule, Frequency, rrulestr } from '../../shared/domain/rrule';

// The RFC 5545 §3.8.5.3 examples give local 9:00 AM and say whether it is EDT or EST.
// EDT = UTC−4, EST = UTC−5 (RFC 5545 §3.3.5 example: "1:30 A.M. EDT (UTC-04:00)", "EST (UTC-05:00)").
type NyZone = 'EDT' | 'EST';
const OFFSET_HOURS: Record<NyZone, number> = { EDT: -4, EST: -5 };

function ny(year: number, month: number, day: number, zone: NyZone, hour = 9, minute = 0): string {
  return new Date(Date.UTC(year, month - 1, day, hour - OFFSET_HOURS[zone], minute)).toISOString();
}
function nyDays(year: number, month: number, days: number[], zone: NyZone): string[] {
  return days.map((d) => ny(year, month, d, zone));
}
function range(from: number, to: number, step = 1): number[] {
  const out: number[] = [];
  for (let d = from; d <= to; d += step) out.push(d);
  return out;
}
function isoList(dates: Date[]): string[] {
  return dates.map((d) => d.toISOString());
}
function nyRule(dtstart: string, rrule: string): string {
  return `DTSTART;TZID=America/New_York:${dtstart}\nRRULE:${rrule}`;
}

describe('rrule wrapper', () => {
  it('exposes a working RRule constructor under vitest (Node ESM interop)', () => {
    expect(typeof RRule).toBe('function');
    expect(typeof rrulestr).toBe('function');
    // RFC 5545 §3.8.5.3, "Every 10 days, 5 occurrences" (dates only; wall clock as UTC, no zone).
    const rule = new RRule({ freq: Frequency.DAILY, interval: 10, count: 5, dtstart: new Date(Date.UTC(1997, 8, 2, 9)) });
    expect(isoList(rule.all())).toEqual(
      [2, 12, 22].map((d) => new Date(Date.UTC(1997, 8, d, 9)).toISOString()).concat([2, 12].map((d) => new Date(Date.UTC(1997, 9, d, 9)).toISOString())),
    );
  });
});

describe('expandRecurrence — RFC 5545 §3.8.5.3 examples (America/New_York)', () => {
  it('Daily for 10 occurrences', () => {
    // RFC 5545 §3.8.5.3, "Daily for 10 occurrences": (1997 9:00 AM EDT) September 2-11
    const got = expandRecurrence(nyRule('19970902T090000', 'FREQ=DAILY;COUNT=10'));
    expect(isoList(got)).toEqual(nyDays(1997, 9, range(2, 11), 'EDT'));
  });

  it('Daily until December 24, 1997 — 09:00 EDT before the October change, 09:00 EST after', () => {
    // RFC 5545 §3.8.5.3, "Daily until December 24, 1997":
    // (1997 9:00 AM EDT) September 2-30;October 1-25
    // (1997 9:00 AM EST) October 26-31;November 1-30;December 1-23
    const got = expandRecurrence(nyRule('19970902T090000', 'FREQ=DAILY;UNTIL=19971224T000000Z'));
    const expected = [
      ...nyDays(1997, 9, range(2, 30), 'EDT'),
      ...nyDays(1997, 10, range(1, 25), 'EDT'),
      ...nyDays(1997, 10, range(26, 31), 'EST'),
      ...nyDays(1997, 11, range(1, 30), 'EST'),
      ...nyDays(1997, 12, range(1, 23), 'EST'),
    ];
    expect(isoList(got)).toEqual(expected);
    // Spot checks around the change: 13:00Z (EDT) on Oct 25, 14:00Z (EST) on Oct 26.
    expect(got.find((d) => d.toISOString().startsWith('1997-10-25'))?.toISOString()).toBe('1997-10-25T13:00:00.000Z');
    expect(got.find((d) => d.toISOString().startsWith('1997-10-26'))?.toISOString()).toBe('1997-10-26T14:00:00.000Z');
  });

  it('Every other day - forever (bounded by limit)', () => {
    // RFC 5545 §3.8.5.3, "Every other day - forever":
    // (1997 9:00 AM EDT) September 2,4,6,8...24,26,28,30; October 2,4,6...20,22,24
    // (1997 9:00 AM EST) October 26,28,30; November 1,3,5,7...25,27,29; December 1,3,...
    const got = expandRecurrence(nyRule('19970902T090000', 'FREQ=DAILY;INTERVAL=2'), { limit: 50 });
    const expected = [
      ...nyDays(1997, 9, range(2, 30, 2), 'EDT'),
      ...nyDays(1997, 10, range(2, 24, 2), 'EDT'),
      ...nyDays(1997, 10, [26, 28, 30], 'EST'),
      ...nyDays(1997, 11, range(1, 29, 2), 'EST'),
      ...nyDays(1997, 12, [1, 3, 5, 7, 9], 'EST'),
    ];
    expect(expected).toHaveLength(50);
    expect(isoList(got)).toEqual(expected);
  });

  it('Weekly for 10 occurrences', () => {
    // RFC 5545 §3.8.5.3, "Weekly for 10 occurrences":
    // (1997 9:00 AM EDT) September 2,9,16,23,30;October 7,14,21  (1997 9:00 AM EST) October 28;November 4
    const got = expandRecurrence(nyRule('19970902T090000', 'FREQ=WEEKLY;COUNT=10'));
    expect(isoList(got)).toEqual([
      ...nyDays(1997, 9, [2, 9, 16, 23, 30], 'EDT'),
      ...nyDays(1997, 10, [7, 14, 21], 'EDT'),
      ny(1997, 10, 28, 'EST'),
      ny(1997, 11, 4, 'EST'),
    ]);
  });

  it('Every other week on Monday, Wednesday, and Friday until December 24, 1997', () => {
    // RFC 5545 §3.8.5.3, "Every other week on Monday, Wednesday, and Friday until December 24, 1997,
    // starting on Monday, September 1, 1997":
    // (1997 9:00 AM EDT) September 1,3,5,15,17,19,29; October 1,3,13,15,17
    // (1997 9:00 AM EST) October 27,29,31; November 10,12,14,24,26,28; December 8,10,12,22
    const got = expandRecurrence(nyRule('19970901T090000', 'FREQ=WEEKLY;INTERVAL=2;UNTIL=19971224T000000Z;WKST=SU;BYDAY=MO,WE,FR'));
    expect(isoList(got)).toEqual([
      ...nyDays(1997, 9, [1, 3, 5, 15, 17, 19, 29], 'EDT'),
      ...nyDays(1997, 10, [1, 3, 13, 15, 17], 'EDT'),
      ...nyDays(1997, 10, [27, 29, 31], 'EST'),
      ...nyDays(1997, 11, [10, 12, 14, 24, 26, 28], 'EST'),
      ...nyDays(1997, 12, [8, 10, 12, 22], 'EST'),
    ]);
  });

  it('Monthly on the first Friday for 10 occurrences', () => {
    // RFC 5545 §3.8.5.3, "Monthly on the first Friday for 10 occurrences":
    // (1997 EDT) September 5;October 3 (1997 EST) November 7;December 5
    // (1998 EST) January 2;February 6;March 6;April 3 (1998 EDT) May 1;June 5
    const got = expandRecurrence(nyRule('19970905T090000', 'FREQ=MONTHLY;COUNT=10;BYDAY=1FR'));
    expect(isoList(got)).toEqual([
      ny(1997, 9, 5, 'EDT'),
      ny(1997, 10, 3, 'EDT'),
      ny(1997, 11, 7, 'EST'),
      ny(1997, 12, 5, 'EST'),
      ny(1998, 1, 2, 'EST'),
      ny(1998, 2, 6, 'EST'),
      ny(1998, 3, 6, 'EST'),
      ny(1998, 4, 3, 'EST'),
      ny(1998, 5, 1, 'EDT'),
      ny(1998, 6, 5, 'EDT'),
    ]);
  });

  it('Monthly on the second-to-last Monday of the month for 6 months', () => {
    // RFC 5545 §3.8.5.3, "Monthly on the second-to-last Monday of the month for 6 months":
    // (1997 EDT) September 22;October 20 (1997 EST) November 17;December 22 (1998 EST) January 19;February 16
    const got = expandRecurrence(nyRule('19970922T090000', 'FREQ=MONTHLY;COUNT=6;BYDAY=-2MO'));
    expect(isoList(got)).toEqual([
      ny(1997, 9, 22, 'EDT'),
      ny(1997, 10, 20, 'EDT'),
      ny(1997, 11, 17, 'EST'),
      ny(1997, 12, 22, 'EST'),
      ny(1998, 1, 19, 'EST'),
      ny(1998, 2, 16, 'EST'),
    ]);
  });

  it('Monthly on the third-to-the-last day of the month, forever (bounded by limit)', () => {
    // RFC 5545 §3.8.5.3, "Monthly on the third-to-the-last day of the month, forever":
    // (1997 EDT) September 28 (1997 EST) October 29;November 28;December 29 (1998 EST) January 29;February 26
    const got = expandRecurrence(nyRule('19970928T090000', 'FREQ=MONTHLY;BYMONTHDAY=-3'), { limit: 6 });
    expect(isoList(got)).toEqual([
      ny(1997, 9, 28, 'EDT'),
      ny(1997, 10, 29, 'EST'),
      ny(1997, 11, 28, 'EST'),
      ny(1997, 12, 29, 'EST'),
      ny(1998, 1, 29, 'EST'),
      ny(1998, 2, 26, 'EST'),
    ]);
  });

  it('Every Tuesday, every other month (bounded by limit)', () => {
    // RFC 5545 §3.8.5.3, "Every Tuesday, every other month":
    // (1997 EDT) September 2,9,16,23,30 (1997 EST) November 4,11,18,25
    // (1998 EST) January 6,13,20,27;March 3,10,17,24,31
    const got = expandRecurrence(nyRule('19970902T090000', 'FREQ=MONTHLY;INTERVAL=2;BYDAY=TU'), { limit: 18 });
    expect(isoList(got)).toEqual([
      ...nyDays(1997, 9, [2, 9, 16, 23, 30], 'EDT'),
      ...nyDays(1997, 11, [4, 11, 18, 25], 'EST'),
      ...nyDays(1998, 1, [6, 13, 20, 27], 'EST'),
      ...nyDays(1998, 3, [3, 10, 17, 24, 31], 'EST'),
    ]);
  });

  it('Yearly in June and July for 10 occurrences', () => {
    // RFC 5545 §3.8.5.3, "Yearly in June and July for 10 occurrences": June 10;July 10 of 1997-2001, all 9:00 AM EDT
    const got = expandRecurrence(nyRule('19970610T090000', 'FREQ=YEARLY;COUNT=10;BYMONTH=6,7'));
    const expected = range(1997, 2001).flatMap((y) => [ny(y, 6, 10, 'EDT'), ny(y, 7, 10, 'EDT')]);
    expect(isoList(got)).toEqual(expected);
  });

  it('The first Saturday that follows the first Sunday of the month (bounded by limit)', () => {
    // RFC 5545 §3.8.5.3, "The first Saturday that follows the first Sunday of the month, forever":
    // (1997 EDT) September 13;October 11 (1997 EST) November 8;December 13
    // (1998 EST) January 10;February 7;March 7 (1998 EDT) April 11;May 9;June 13
    const got = expandRecurrence(nyRule('19970913T090000', 'FREQ=MONTHLY;BYDAY=SA;BYMONTHDAY=7,8,9,10,11,12,13'), {
      limit: 10,
    });
    expect(isoList(got)).toEqual([
      ny(1997, 9, 13, 'EDT'),
      ny(1997, 10, 11, 'EDT'),
      ny(1997, 11, 8, 'EST'),
      ny(1997, 12, 13, 'EST'),
      ny(1998, 1, 10, 'EST'),
      ny(1998, 2, 7, 'EST'),
      ny(1998, 3, 7, 'EST'),
      ny(1998, 4, 11, 'EDT'),
      ny(1998, 5, 9, 'EDT'),
      ny(1998, 6, 13, 'EDT'),
    ]);
  });

  it('The third instance into the month of one of Tuesday, Wednesday, or Thursday, for the next 3 months', () => {
    // RFC 5545 §3.8.5.3, BYSETPOS example: (1997 EDT) September 4;October 7 (1997 EST) November 6
    const got = expandRecurrence(nyRule('19970904T090000', 'FREQ=MONTHLY;COUNT=3;BYDAY=TU,WE,TH;BYSETPOS=3'));
    expect(isoList(got)).toEqual([ny(1997, 9, 4, 'EDT'), ny(1997, 10, 7, 'EDT'), ny(1997, 11, 6, 'EST')]);
  });

  it('WKST changes the result (MO vs SU)', () => {
    // RFC 5545 §3.8.5.3, "An example where the days generated makes a difference because of WKST":
    // WKST=MO ==> (1997 EDT) August 5,10,19,24 ; WKST=SU ==> (1997 EDT) August 5,17,19,31
    const mo = expandRecurrence(nyRule('19970805T090000', 'FREQ=WEEKLY;INTERVAL=2;COUNT=4;BYDAY=TU,SU;WKST=MO'));
    const su = expandRecurrence(nyRule('19970805T090000', 'FREQ=WEEKLY;INTERVAL=2;COUNT=4;BYDAY=TU,SU;WKST=SU'));
    expect(isoList(mo)).toEqual(nyDays(1997, 8, [5, 10, 19, 24], 'EDT'));
    expect(isoList(su)).toEqual(nyDays(1997, 8, [5, 17, 19, 31], 'EDT'));
  });

  it('An invalid date (February 30) is ignored, and EST becomes EDT in March 2007', () => {
    // RFC 5545 §3.8.5.3: (2007 EST) January 15,30 (2007 EST) February 15 (2007 EDT) March 15,30
    const got = expandRecurrence(nyRule('20070115T090000', 'FREQ=MONTHLY;BYMONTHDAY=15,30;COUNT=5'));
    expect(isoList(got)).toEqual([ny(2007, 1, 15, 'EST'), ny(2007, 1, 30, 'EST'), ny(2007, 2, 15, 'EST'), ny(2007, 3, 15, 'EDT'), ny(2007, 3, 30, 'EDT')]);
  });
});

describe('expandRecurrence — bounds, UTC and floating starts', () => {
  const daily = nyRule('19970902T090000', 'FREQ=DAILY;COUNT=10');

  it('after/before are exclusive by default and inclusive on request', () => {
    // Derived from RFC 5545 §3.8.5.3 "Daily for 10 occurrences" (September 2-11, 9:00 AM EDT = 13:00Z).
    const after = new Date(ny(1997, 9, 4, 'EDT'));
    const before = new Date(ny(1997, 9, 7, 'EDT'));
    expect(isoList(expandRecurrence(daily, { after, before }))).toEqual(nyDays(1997, 9, [5, 6], 'EDT'));
    expect(isoList(expandRecurrence(daily, { after, before, inclusive: true }))).toEqual(nyDays(1997, 9, [4, 5, 6, 7], 'EDT'));
  });

  it('limit caps the number of results and defaults to 1000 for an unbounded rule', () => {
    // Every other day forever (RFC 5545 §3.8.5.3) has no end: the default limit must stop it.
    expect(expandRecurrence(nyRule('19970902T090000', 'FREQ=DAILY;INTERVAL=2'))).toHaveLength(1000);
    expect(expandRecurrence(daily, { limit: 3 })).toHaveLength(3);
  });

  it('a far-future window returns the right instants without listing everything before it', () => {
    // Every other day from 1997-09-02 lands on even day counts; 2026-01-01 is 10 348 days later (even),
    // so 2026-01-01 and 2026-01-03 09:00 EST (14:00Z) are occurrences — hand-worked from day counts.
    const got = expandRecurrence(nyRule('19970902T090000', 'FREQ=DAILY;INTERVAL=2'), {
      after: new Date('2026-01-01T00:00:00Z'),
      limit: 2,
    });
    expect(isoList(got)).toEqual(['2026-01-01T14:00:00.000Z', '2026-01-03T14:00:00.000Z']);
  });

  it('DTSTART in UTC (trailing Z) stays at the same UTC time', () => {
    // RFC 5545 §3.3.5 FORM #2 (UTC time): "19980119T070000Z" is 07:00 UTC.
    const got = expandRecurrence('DTSTART:19980119T070000Z\nRRULE:FREQ=WEEKLY;COUNT=3');
    expect(isoList(got)).toEqual(['1998-01-19T07:00:00.000Z', '1998-01-26T07:00:00.000Z', '1998-02-02T07:00:00.000Z']);
  });

  it('a floating DTSTART is read in the given zone (default UTC)', () => {
    // RFC 5545 §3.3.5 FORM #1: floating time is the same wall-clock time in whatever zone applies.
    const text = 'DTSTART:19970714T133000\nRRULE:FREQ=DAILY;COUNT=2';
    expect(isoList(expandRecurrence(text))).toEqual(['1997-07-14T13:30:00.000Z', '1997-07-15T13:30:00.000Z']);
    // RFC 5545 §3.3.5 example: 19970714T133000 in America/New_York = 19970714T173000Z.
    expect(isoList(expandRecurrence(text, { floatingZone: 'America/New_York' }))[0]).toBe('1997-07-14T17:30:00.000Z');
  });

  it('accepts CRLF line ends, folded lines and an RRULE with parts in any order', () => {
    // RFC 5545 §3.1 (CRLF + space continues a line) and §3.3.10 ("MUST accept rule parts ordered in any sequence").
    const text = 'DTSTART;TZID=America/New_York:19970902T090000\r\nRRULE:COUNT=10;\r\n FREQ=WEEKLY';
    expect(expandRecurrence(text)).toHaveLength(10);
    expect(parseRecurrence(text).rrule).toBe('FREQ=WEEKLY;COUNT=10');
  });

  it('a date-only DTSTART gives whole days at local midnight', () => {
    // RFC 5545 §3.3.4 DATE value "19970714" (July 14, 1997); floating, read in UTC by default.
    const got = expandRecurrence('DTSTART;VALUE=DATE:19970714\nRRULE:FREQ=YEARLY;COUNT=2');
    expect(isoList(got)).toEqual(['1997-07-14T00:00:00.000Z', '1998-07-14T00:00:00.000Z']);
  });
});

describe('daylight-saving changes (RFC 5545 §3.3.5; summer time per Directive 2000/84/EC)', () => {
  // Directive 2000/84/EC Arts. 1-2: summer time runs from 01:00 UTC on the last Sunday of March to
  // 01:00 UTC on the last Sunday of October. In 2024 those Sundays are 31 March and 27 October.
  // Europe/Berlin: CET = UTC+1, CEST = UTC+2.

  it('09:00 Europe/Berlin stays 09:00 local across the spring change (08:00Z → 07:00Z)', () => {
    const got = expandRecurrence('DTSTART;TZID=Europe/Berlin:20240329T090000\nRRULE:FREQ=DAILY;COUNT=4');
    expect(isoList(got)).toEqual(['2024-03-29T08:00:00.000Z', '2024-03-30T08:00:00.000Z', '2024-03-31T07:00:00.000Z', '2024-04-01T07:00:00.000Z']);
  });

  it('09:00 Europe/Berlin stays 09:00 local across the autumn change (07:00Z → 08:00Z)', () => {
    const got = expandRecurrence('DTSTART;TZID=Europe/Berlin:20241026T090000\nRRULE:FREQ=DAILY;COUNT=3');
    expect(isoList(got)).toEqual(['2024-10-26T07:00:00.000Z', '2024-10-27T08:00:00.000Z', '2024-10-28T08:00:00.000Z']);
  });

  it('a generated 02:30 on the spring-forward day is shifted forward by the gap (03:30 CEST)', () => {
    // RFC 5545 §3.3.5: a non-existent local time "is interpreted using the UTC offset before the gap".
    // 2024-03-31 02:30 with CET (+01:00) = 01:30Z = 03:30 CEST.
    const got = expandRecurrence('DTSTART;TZID=Europe/Berlin:20240330T023000\nRRULE:FREQ=DAILY;COUNT=3');
    expect(isoList(got)).toEqual(['2024-03-30T01:30:00.000Z', '2024-03-31T01:30:00.000Z', '2024-04-01T00:30:00.000Z']);
  });

  it("with nonexistent: 'skip' the gap instance is dropped and not counted", () => {
    // RFC 5545 §3.3.10: instances with a nonexistent local time "MUST be ignored and MUST NOT be counted".
    const got = expandRecurrence('DTSTART;TZID=Europe/Berlin:20240330T023000\nRRULE:FREQ=DAILY;COUNT=3', {
      nonexistent: 'skip',
    });
    expect(isoList(got)).toEqual(['2024-03-30T01:30:00.000Z', '2024-04-01T00:30:00.000Z', '2024-04-02T00:30:00.000Z']);
  });

  it('an ambiguous 02:30 on the fall-back day is the first occurrence (CEST)', () => {
    // RFC 5545 §3.3.5: an ambiguous local time "refers to the first occurrence of the referenced time".
    // 2024-10-27 02:30 CEST (+02:00) = 00:30Z; the next day 02:30 CET (+01:00) = 01:30Z.
    const got = expandRecurrence('DTSTART;TZID=Europe/Berlin:20241026T023000\nRRULE:FREQ=DAILY;COUNT=3');
    expect(isoList(got)).toEqual(['2024-10-26T00:30:00.000Z', '2024-10-27T00:30:00.000Z', '2024-10-28T01:30:00.000Z']);
  });

  it('RFC 5545 §3.3.5 America/New_York examples: ambiguous 01:30 is EDT, non-existent 02:30 reads as 03:30 EDT', () => {
    // "TZID=America/New_York:20071104T013000 indicates November 4, 2007 at 1:30 A.M. EDT (UTC-04:00)"
    expect(localToInstant({ year: 2007, month: 11, day: 4, hour: 1, minute: 30, second: 0 }, 'America/New_York')).toEqual({
      instant: new Date('2007-11-04T05:30:00.000Z'),
      nonexistent: false,
    });
    // "TZID=America/New_York:20070311T023000 indicates March 11, 2007 at 3:30 A.M. EDT (UTC-04:00)"
    expect(localToInstant({ year: 2007, month: 3, day: 11, hour: 2, minute: 30, second: 0 }, 'America/New_York')).toEqual({
      instant: new Date('2007-03-11T07:30:00.000Z'),
      nonexistent: true,
    });
    // As a DTSTART the ambiguous time is accepted and gives EDT.
    expect(isoList(expandRecurrence(nyRule('20071104T013000', 'FREQ=DAILY;COUNT=1')))).toEqual(['2007-11-04T05:30:00.000Z']);
  });

  it('rejects a DTSTART that does not exist in its zone', () => {
    const r = validateRecurrence('DTSTART;TZID=Europe/Berlin:20240331T023000\nRRULE:FREQ=WEEKLY');
    expect(r.ok).toBe(false);
    expect(!r.ok && r.error).toMatch(/does not exist in Europe\/Berlin/);
    expect(() => expandRecurrence(nyRule('20070311T023000', 'FREQ=DAILY'))).toThrow(/does not exist in America\/New_York/);
  });
});

describe('previousOccurrence', () => {
  it('finds the last occurrence before (or at, inclusive) an instant', () => {
    // RFC 5545 §3.8.5.3 "Weekly for 10 occurrences": ... October 21 (EDT), October 28 (EST) ...
    const text = nyRule('19970902T090000', 'FREQ=WEEKLY;COUNT=10');
    const oct28 = new Date(ny(1997, 10, 28, 'EST'));
    expect(previousOccurrence(text, oct28)?.toISOString()).toBe(ny(1997, 10, 21, 'EDT'));
    expect(previousOccurrence(text, oct28, { inclusive: true })?.toISOString()).toBe(ny(1997, 10, 28, 'EST'));
    expect(previousOccurrence(text, new Date(ny(1997, 9, 2, 'EDT')))).toBeNull();
    // After the last (10th) occurrence, November 4, the answer stays November 4.
    expect(previousOccurrence(text, new Date('2030-01-01T00:00:00Z'))?.toISOString()).toBe(ny(1997, 11, 4, 'EST'));
  });
});

describe('validation errors name the problem', () => {
  const cases: [string, string, RegExp][] = [
    ['missing DTSTART', 'RRULE:FREQ=DAILY', /missing DTSTART/],
    ['missing RRULE', 'DTSTART:19970902T090000Z', /missing RRULE/],
    ['empty text', '   ', /empty/],
    ['no FREQ', 'DTSTART:19970902T090000Z\nRRULE:COUNT=3', /no FREQ/],
    ['bad FREQ', 'DTSTART:19970902T090000Z\nRRULE:FREQ=FORTNIGHTLY', /FREQ "FORTNIGHTLY"/],
    ['COUNT and UNTIL', 'DTSTART:19970902T090000Z\nRRULE:FREQ=DAILY;COUNT=3;UNTIL=19971224T000000Z', /both COUNT and UNTIL/],
    ['unknown part', 'DTSTART:19970902T090000Z\nRRULE:FREQ=DAILY;EVERY=2', /unknown RRULE part "EVERY"/],
    ['bad BYDAY', 'DTSTART:19970902T090000Z\nRRULE:FREQ=WEEKLY;BYDAY=MO,XX', /BYDAY value "XX"/],
    ['BYMONTH out of range', 'DTSTART:19970902T090000Z\nRRULE:FREQ=YEARLY;BYMONTH=13', /BYMONTH value "13" is out of range/],
    ['repeated part', 'DTSTART:19970902T090000Z\nRRULE:FREQ=DAILY;COUNT=2;COUNT=3', /COUNT appears more than once/],
    ['zero INTERVAL', 'DTSTART:19970902T090000Z\nRRULE:FREQ=DAILY;INTERVAL=0', /INTERVAL must be a positive integer/],
    ['ordinal BYDAY with WEEKLY', 'DTSTART:19970902T090000Z\nRRULE:FREQ=WEEKLY;BYDAY=1MO', /ordinal/],
    ['BYSETPOS alone', 'DTSTART:19970902T090000Z\nRRULE:FREQ=MONTHLY;BYSETPOS=1', /BYSETPOS must be used together/],
    ['unknown zone', 'DTSTART;TZID=Mars/Olympus_Mons:19970902T090000\nRRULE:FREQ=DAILY', /unknown time zone "Mars\/Olympus_Mons"/],
    ['TZID with Z', 'DTSTART;TZID=Europe/Berlin:19970902T090000Z\nRRULE:FREQ=DAILY', /both TZID and a trailing Z/],
    ['UTC offset form', 'DTSTART:19980119T230000-0800\nRRULE:FREQ=DAILY', /UTC offset/],
    ['not a date', 'DTSTART:19970231T090000Z\nRRULE:FREQ=DAILY', /not a calendar date/],
    ['EXDATE', 'DTSTART:19970902T090000Z\nEXDATE:19970903T090000Z\nRRULE:FREQ=DAILY', /EXDATE is not supported/],
    ['two RRULEs', 'DTSTART:19970902T090000Z\nRRULE:FREQ=DAILY\nRRULE:FREQ=WEEKLY', /more than one RRULE/],
    ['UNTIL type mismatch', 'DTSTART:19970902T090000Z\nRRULE:FREQ=DAILY;UNTIL=19971224', /UNTIL must be a DATE-TIME/],
    ['HOURLY', 'DTSTART:19970902T090000Z\nRRULE:FREQ=HOURLY;INTERVAL=3', /FREQ=HOURLY is not supported/],
    ['impossible rule', 'DTSTART:19970902T090000Z\nRRULE:FREQ=YEARLY;BYMONTH=2;BYMONTHDAY=30', /produces no occurrences/],
  ];
  for (const [name, text, message] of cases) {
    it(`${name}`, () => {
      const r = validateRecurrence(text);
      expect(r.ok).toBe(false);
      expect(!r.ok && r.error).toMatch(message);
      expect(() => expandRecurrence(text)).toThrow(message);
    });
  }

  it('rejects a bad limit and bad bounds', () => {
    const text = 'DTSTART:19970902T090000Z\nRRULE:FREQ=DAILY';
    expect(() => expandRecurrence(text, { limit: 0 })).toThrow(/limit must be a positive integer/);
    expect(() => expandRecurrence(text, { after: new Date('nonsense') })).toThrow(/after must be a valid Date/);
  });

  it('accepts a valid rule', () => {
    expect(validateRecurrence(nyRule('19970902T090000', 'FREQ=DAILY;COUNT=10'))).toEqual({ ok: true });
  });
});

describe('buildRecurrenceText', () => {
  it('builds DTSTART;TZID + RRULE from a local start and round-trips through the parser', () => {
    // 2024-03-04 is a Monday in winter time: 07:00 CET = 06:00Z (Directive 2000/84/EC: CET before 31 March).
    const text = buildRecurrenceText({ start: '2024-03-04T07:00', tzid: 'europe/berlin', rrule: 'freq=weekly;byday=MO' });
    expect(text).toBe('DTSTART;TZID=Europe/Berlin:20240304T070000\nRRULE:FREQ=WEEKLY;BYDAY=MO');
    expect(isoList(expandRecurrence(text, { limit: 2 }))).toEqual(['2024-03-04T06:00:00.000Z', '2024-03-11T06:00:00.000Z']);
    const parsed = parseRecurrence(text);
    expect(parsed).toMatchObject({ startLocal: '2024-03-04T07:00:00', tzid: 'Europe/Berlin', form: 'zoned', freq: 'WEEKLY' });
  });

  it('renders a Date start as wall-clock time in the zone, and UTC as a trailing Z', () => {
    const start = new Date('2024-03-04T06:00:00Z');
    expect(buildRecurrenceText({ start, tzid: 'Europe/Berlin', rrule: 'RRULE:FREQ=DAILY' })).toBe(
      'DTSTART;TZID=Europe/Berlin:20240304T070000\nRRULE:FREQ=DAILY',
    );
    expect(buildRecurrenceText({ start, tzid: 'UTC', rrule: 'FREQ=DAILY' })).toBe('DTSTART:20240304T060000Z\nRRULE:FREQ=DAILY');
  });

  it('rejects a start inside a DST gap, a malformed start and a bad rule', () => {
    expect(() => buildRecurrenceText({ start: '2024-03-31T02:30', tzid: 'Europe/Berlin', rrule: 'FREQ=DAILY' })).toThrow(/does not exist/);
    expect(() => buildRecurrenceText({ start: '2024-03-31 02:30+01:00', tzid: 'Europe/Berlin', rrule: 'FREQ=DAILY' })).toThrow(/not a local ISO date-time/);
    expect(() => buildRecurrenceText({ start: '2024-03-04T07:00', tzid: 'Europe/Berlin', rrule: 'FREQ=DAYLY' })).toThrow(/FREQ "DAYLY"/);
  });

  it('says which part is at fault, so a form can put the message on the right field', () => {
    const partOf = (start: string, rrule: string) => {
      try {
        buildRecurrenceText({ start, tzid: 'Europe/Berlin', rrule });
        return 'none';
      } catch (err) {
        return err instanceof RecurrenceError ? err.part : 'not a RecurrenceError';
      }
    };
    // 31 March 2024 02:30 does not exist in Berlin (Directive 2000/84/EC: clocks go 02:00 CET → 03:00 CEST).
    expect(partOf('2024-03-31T02:30', 'FREQ=DAILY')).toBe('start');
    expect(partOf('2024-03-31 02:30+01:00', 'FREQ=DAILY')).toBe('start');
    expect(partOf('2024-03-04T07:00', 'FREQ=DAYLY')).toBe('rule');
    expect(partOf('2024-03-04T07:00', 'FREQ=WEEKLY;UNTIL=20241399T000000Z')).toBe('rule');
    expect(validateRecurrence('DTSTART:20240231T070000Z\nRRULE:FREQ=DAILY')).toEqual({
      ok: false,
      error: expect.stringMatching(/not a calendar date/),
      part: 'start',
    });
  });
});
