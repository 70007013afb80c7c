import { describe, expect, it } from 'vitest';
import { forecastReach, forecastWindow, windowedUsageRate, FORECAST_WINDOW_DAYS } from '../../shared/domain/forecast';
import { evaluatePlan } from '../../shared/domain/due';

const DAY = 86_400_000;
const MIN = 60_000;
// 2024-01-01 is a Monday.
const MONDAY = Date.UTC(2024, 0, 1);

/**
 * A counter exported every 15 minutes during weekday day shifts only (06:00–14:00, Monday to Friday),
 * counting `perShiftHour` arc starts an hour at a steady pace, for `weeks` weeks. No readings at night
 * or at weekends. True rate per calendar day = perShiftHour × 8 h × 5 days / 7 days.
 */
function shiftReadings(weeks: number, perShiftHour: number) {
  const out: { at: Date; value: number }[] = [];
  let value = 10_000;
  for (let d = 0; d < weeks * 7; d++) {
    if (d % 7 >= 5) continue;
    for (let m = 0; m <= 8 * 60; m += 15) out.push({ at: new Date(MONDAY + d * DAY + 6 * 60 * MIN + m * MIN), value: value + (perShiftHour * m) / 60 });
    value += perShiftHour * 8;
  }
  return out;
}

describe('usage rate over a time window, per calendar day', () => {
  const PER_HOUR = 60;
  const TRUE_RATE = (PER_HOUR * 8 * 5) / 7; // 342.86 arc starts per calendar day (worked by hand)
  const all = shiftReadings(5, PER_HOUR);

  it('weekday-shift readings every 15 minutes over 5 weeks: within 5 % of the true calendar rate, whenever it is asked', () => {
    // Asked at every hour of the fifth week (Monday 00:00 to Sunday 23:00): the readings up to then.
    for (let h = 0; h < 7 * 24; h++) {
      const now = MONDAY + 28 * DAY + h * 3_600_000;
      const seen = all.filter((r) => r.at.getTime() <= now);
      const rate = windowedUsageRate(seen)!;
      expect(Math.abs(rate.ratePerDay / TRUE_RATE - 1)).toBeLessThan(0.05);
      expect(rate.provisional).toBe(false);
    }
  });

  it('the last 24 readings (6 hours of one shift) would have given about 4× the calendar rate', () => {
    // Why the window is in days: 24 readings × 15 min = 6 h at 60/h = 1 440 per day of fitted time.
    const last24 = all.slice(-24);
    const fit = windowedUsageRate(last24)!;
    expect(fit.ratePerDay / TRUE_RATE).toBeGreaterThan(3.5);
    expect(fit.provisional).toBe(true);
  });

  it('gives a forecast over a weekend, from the latest reading (Friday 14:00)', () => {
    const upToSunday = all.filter((r) => r.at.getTime() <= MONDAY + 34 * DAY + 12 * 3_600_000);
    const latest = upToSunday.at(-1)!;
    const when = forecastReach(upToSunday, latest.value + 10 * TRUE_RATE)!;
    // 10 calendar days of use from Friday 14:00, within 5 %
    expect(Math.abs((when.getTime() - latest.at.getTime()) / DAY - 10)).toBeLessThan(0.5);
  });

  it('the due engine uses the same rate: a meter plan on shift readings forecasts within 5 % of the true date', () => {
    const seen = all.filter((r) => r.at.getTime() <= MONDAY + 32 * DAY + 10 * 3_600_000); // Friday 10:00, week 5
    const latest = seen.at(-1)!;
    const due = evaluatePlan({
      now: new Date(latest.at.getTime() + 60_000),
      startedAt: new Date(MONDAY),
      lastDoneAt: null,
      lastRaisedKey: null,
      triggers: [{ kind: 'meter', meterId: 'arcs', every: latest.value - 10_000 + 20 * TRUE_RATE }],
      meters: { arcs: { baseline: 10_000, latest, recent: seen } },
      dueSoon: { days: 2 },
    });
    const days = (due.dueMeter[0].forecastAt!.getTime() - latest.at.getTime()) / DAY;
    expect(Math.abs(days / 20 - 1)).toBeLessThan(0.05);
  });

  it('the window is 28 days before the latest reading, whatever the count', () => {
    const win = forecastWindow(all);
    const latest = all.at(-1)!.at.getTime();
    expect(win[0].at.getTime()).toBeGreaterThanOrEqual(latest - FORECAST_WINDOW_DAYS * DAY);
    expect(win.length).toBe(all.filter((r) => r.at.getTime() >= latest - 28 * DAY).length);
  });

  it('reaches back past 28 days for a span of at least 14 days (a meter read monthly)', () => {
    const monthly = [0, 30, 60, 90].map((d, i) => ({ at: new Date(MONDAY + d * DAY), value: 1000 * i }));
    const win = forecastWindow(monthly);
    expect(win.map((r) => r.value)).toEqual([2000, 3000]);
    expect(windowedUsageRate(monthly)!.ratePerDay).toBeCloseTo(1000 / 30, 10);
  });

  it('marks a rate from under 14 days of readings as provisional', () => {
    const young = [0, 1, 2, 3].map((d) => ({ at: new Date(MONDAY + d * DAY), value: 10 * d }));
    expect(windowedUsageRate(young)).toMatchObject({ ratePerDay: 10, provisional: true, readings: 4 });
  });
});
