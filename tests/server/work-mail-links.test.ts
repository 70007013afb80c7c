import { describe, it, expect, beforeAll, beforeEach, afterAll } from 'vitest';
import type { MikroORM } from '@mikro-orm/postgresql';
import { makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { initORM } from '../../server/db';
import { runDueEngine } from '../../server/jobs/due-engine';
import { WORK_CAUTION } from '../../shared/domain/cautions';
import { drainOutbox, makeMachine, patch, pendingMails, planBody, post, scoped } from './work-orders-fixtures';

// Every work mail links each work order it names to that work order's own page.

let t: Awaited<ReturnType<typeof makeTestApp>>;
let orm: MikroORM;
let shop: TestShop;
let admin: SignedIn;
let unit: string;

const workOrderUrl = (id: string) => `${t.config.APP_URL}/work-orders/${id}`;

beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
});
beforeEach(async () => {
  shop = await makeShop(t.em(), 'mail-links');
  admin = await signIn(t.app, shop.users.admin.email);
  unit = await makeMachine(scoped(t.em(), shop.orgId), shop.orgId, 'ML1');
});
afterAll(() => t.close());

describe('links in work mails', () => {
  it('a notice listing several new work orders links each one to its page', async () => {
    const planIds: string[] = [];
    for (const title of ['Grease the ram', 'Check the clamp', 'Clean the filter']) {
      const res = await post(admin, '/plans', planBody(unit, { title, checklist: [], triggers: [{ kind: 'calendar-floating', every: 1, unit: 'week' }] }));
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      planIds.push(res.body.id);
    }
    await orm.em
      .fork()
      .execute(`update maintenance_plan set started_at = ?, recheck_at = null where id = any(?::uuid[])`, [
        new Date('2026-03-01T06:00:00Z'),
        `{${planIds.join(',')}}`,
      ]);
    await drainOutbox(orm);
    await runDueEngine(orm, new Date('2026-03-08T07:00:00Z'), { appUrl: t.config.APP_URL, orgId: shop.orgId });
    const ids: { id: string }[] = await orm.em.fork().execute(`select id from work_order where plan_id = any(?::uuid[])`, [`{${planIds.join(',')}}`]);
    expect(ids).toHaveLength(3);

    const mails = (await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-raised');
    expect(mails).toHaveLength(1);
    expect(mails[0].subject).toMatch(/^3 new work orders for you/);
    for (const { id } of ids) {
      expect(mails[0].textBody).toContain(workOrderUrl(id));
      expect(mails[0].htmlBody).toContain(`href="${workOrderUrl(id)}"`);
    }
    expect(mails[0].textBody).toContain(WORK_CAUTION);
  });

  it('naming someone on the work mails them a link to it', async () => {
    const raised = await post(admin, '/work-orders', {
      machineId: unit,
      title: 'Replace the worn wiper',
      instructions: 'Isolate first.',
      requiresLockout: false,
      safetyCritical: false,
    });
    expect(raised.status, JSON.stringify(raised.body)).toBe(201);
    await drainOutbox(orm);

    await patch(admin, `/work-orders/${raised.body.id}`, { assigneeId: shop.users.technician.userId }).expect(200);
    const mails = (await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-assigned');
    expect(mails.map((m) => m.toAddress)).toEqual([shop.users.technician.email]);
    expect(mails[0].subject).toBe(`Assigned to you: WO ${raised.body.number} Replace the worn wiper on ML1`);
    expect(mails[0].textBody).toContain(workOrderUrl(raised.body.id));
    expect(mails[0].textBody).not.toContain('assignee=me');
    expect(mails[0].textBody).toContain(WORK_CAUTION);

    // Saving the same assignee again, or naming oneself, mails nobody.
    await patch(admin, `/work-orders/${raised.body.id}`, { assigneeId: shop.users.technician.userId }).expect(200);
    await patch(admin, `/work-orders/${raised.body.id}`, { assigneeId: shop.users.admin.userId }).expect(200);
    expect((await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'work-assigned')).toHaveLength(1);
  });
});
