import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, signIn, type TestShop } from '../setup/test-app';
import { recordActivity } from '../../server/modules/activity-log/activity-log.service';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeShop(t.em(), 'activity');
  const em = t.em();
  const at = (minutes: number) => new Date(Date.UTC(2026, 10, 2, 8, minutes));
  recordActivity(
    em,
    { orgId: shop.orgId, userId: shop.users.technician.userId },
    'work-order.closed',
    { type: 'WorkOrder', id: 'w1' },
    { number: 1042 },
  ).createdAt = at(1);
  recordActivity(em, { orgId: shop.orgId, userId: null }, 'work-order.raised', { type: 'WorkOrder', id: 'w2' }, { number: 1043 }).createdAt = at(2);
  recordActivity(
    em,
    { orgId: shop.orgId, userId: shop.users.admin.userId },
    'plan.updated',
    { type: 'MaintenancePlan', id: 'p1' },
    { title: 'Renew filter' },
  ).createdAt = at(3);
  await em.flush();
});
afterAll(() => t.close());

describe('the activity log', () => {
  it('filters by area and by person (or the system), sorts by time either way, and offers its areas and people', async () => {
    const { agent } = await signIn(t.app, shop.users.admin.email);
    const all = await agent.get('/api/audit-events').expect(200);
    expect(all.body.areas).toEqual(expect.arrayContaining(['plan', 'work-order']));
    expect(all.body.people.map((p: { id: string }) => p.id)).toContain(shop.users.technician.userId);

    const work = await agent.get('/api/audit-events?area=work-order').expect(200);
    expect(work.body.rows.map((r: { action: string }) => r.action)).toEqual(['work-order.raised', 'work-order.closed']);
    const oldestFirst = await agent.get('/api/audit-events?area=work-order&dir=asc').expect(200);
    expect(oldestFirst.body.rows.map((r: { action: string }) => r.action)).toEqual(['work-order.closed', 'work-order.raised']);

    const system = await agent.get('/api/audit-events?actor=system&area=work-order').expect(200);
    expect(system.body.rows.map((r: { details: { number: number } }) => r.details.number)).toEqual([1043]);
    const tech = await agent.get(`/api/audit-events?actor=${shop.users.technician.userId}`).expect(200);
    expect(tech.body.rows).toEqual([expect.objectContaining({ action: 'work-order.closed', actor: `technician of ${shop.slug}` })]);

    const bad = await agent.get('/api/audit-events?actor=somebody').expect(400);
    expect(bad.body.fields[0].path).toBe('actor');
  });
});
