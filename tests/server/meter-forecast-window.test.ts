import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { loadMeterSeries } from '../../server/modules/plans/plan-inputs';
import { windowedUsageRate } from '../../shared/domain/forecast';
import { setClock } from '../../shared/clock';
import { get, makeMachine, makeMeter, scoped } from './work-orders-fixtures';
import { MeterReading } from '../../server/modules/meters/meter.entity';

const DAY = 86_400_000;
// 2026-01-05 is a Monday.
const MONDAY = Date.UTC(2026, 0, 5);
const PER_HOUR = 60;
const TRUE_RATE = (PER_HOUR * 8 * 5) / 7; // arc starts per calendar day, worked by hand

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;
let tech: SignedIn;
let meterId: string;

beforeAll(async () => {
  setClock(new Date(MONDAY + 33 * DAY + 12 * 3_600_000)); // Saturday of the fifth week, noon
  t = await makeTestApp();
  shop = await makeShop(t.em(), 'fcw');
  tech = await signIn(t.app, shop.users.technician.email);
  const em = scoped(t.em(), shop.orgId);
  const cell = await makeMachine(em, shop.orgId, 'C1', 'punch-plasma-cell');
  meterId = await makeMeter(em, shop.orgId, cell, 'arc-starts', 'count', 'starts');
  // Every 15 minutes during weekday day shifts (06:00–14:00) for five weeks; nothing at night or at weekends.
  let value = 0;
  for (let d = 0; d < 33; d++) {
    if (d % 7 >= 5) continue;
    for (let m = 0; m <= 480; m += 15) {
      em.create(MeterReading, {
        organization: shop.orgId,
        meter: meterId,
        value: value + (PER_HOUR * m) / 60,
        readAt: new Date(MONDAY + d * DAY + 6 * 3_600_000 + m * 60_000),
        source: 'import',
        isReset: false,
      });
    }
    value += PER_HOUR * 8;
  }
  await em.flush();
});
afterAll(async () => {
  setClock(null);
  await t.close();
});

describe('meter forecasts over a time window', () => {
  it('the due engine reads every reading of the 28 days before the latest one, whatever their count', async () => {
    const series = (await loadMeterSeries(t.em(), [meterId], new Date(MONDAY + 33 * DAY + 12 * 3_600_000))).get(meterId)!;
    const latest = series.readings.at(-1)!.at.getTime();
    // Friday 14:00 of week five is the latest; 28 days back holds 20 shift days × 33 readings (and one from the 28th day back).
    expect(new Date(latest).toISOString()).toBe('2026-02-06T14:00:00.000Z');
    expect(series.readings[0].at.getTime()).toBeGreaterThanOrEqual(latest - 28 * DAY);
    expect(series.readings.length).toBeGreaterThan(600);
    const rate = windowedUsageRate(series.readings)!;
    expect(Math.abs(rate.ratePerDay / TRUE_RATE - 1)).toBeLessThan(0.05);
  });

  it('the meter page shows the same rate per calendar day, over a weekend too', async () => {
    const res = await get(tech, `/meters/${meterId}/trend?days=7`).expect(200);
    expect(Math.abs(res.body.ratePerDay / TRUE_RATE - 1)).toBeLessThan(0.05);
    expect(res.body.rate).toMatchObject({ provisional: false, windowDays: 28 });
  });
});
