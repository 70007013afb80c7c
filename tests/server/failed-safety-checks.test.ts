// A failed safety-critical check has consequences: the work cannot be signed off as done until
// repair work is raised (machine out of service until it is done) or the safety officer signs a
// deviation; signing off safety work asks for the password like the safety log's signatures.
import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import type { MikroORM } from '@mikro-orm/postgresql';
import { setClock } from '../../shared/clock';
import { makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { initORM } from '../../server/db';
import { runDueEngine } from '../../server/jobs/due-engine';
import { DEMO_PASSWORD } from '../../seed/factories';
import { get, post, put } from './work-orders-fixtures';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let orm: MikroORM;
let a: TestShop;
let admin: SignedIn;
let tech: SignedIn;
let safety: SignedIn;

const chainCount = async (meaning: string) =>
  Number((await orm.em.fork().execute(`select count(*) as n from safety_sign_off where organization_id = ? and meaning = ?`, [a.orgId, meaning]))[0].n);

/** A press brake with the guarding starter and its weekly work raised. */
async function brakeWithGuardWork(code: string) {
  setClock('2026-03-02T05:00:00Z');
  const brake = (await post(tech, '/machines', { code, name: `Brake ${code}`, kind: 'press-brake' }).expect(201)).body.id;
  const plan = (await post(admin, '/plan-starters/apply', { machineId: brake, starterKeys: ['brake-guarding'] }).expect(201)).body.created[0].planId;
  setClock('2026-03-09T12:00:00Z');
  await runDueEngine(orm, new Date('2026-03-09T12:00:00Z'), { appUrl: t.config.APP_URL, orgId: a.orgId });
  const [wo]: { id: string; number: number }[] = await orm.em.fork().execute(`select id, number from work_order where plan_id = ? and status = 'open'`, [plan]);
  expect(wo, 'guard work raised').toBeTruthy();
  return { brake, plan, wo };
}

const failGuard = (woId: string) =>
  put(tech, `/work-orders/${woId}/checklist`, {
    results: [
      { key: 'guard', result: 'fail', note: 'Beam kept moving with the test piece in the curtain' },
      { key: 'estops', result: 'pass' },
      { key: 'footswitch', result: 'pass' },
    ],
  }).expect(200);

beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
  a = await makeShop(t.em(), 'failed-checks');
  admin = await signIn(t.app, a.users.admin.email);
  tech = await signIn(t.app, a.users.technician.email);
  safety = await signIn(t.app, a.users.safety.email);
});
afterEach(() => setClock(null));
afterAll(() => t.close());

describe('a failed guard check', () => {
  it('cannot be signed off; repair work takes the brake out of service until the repair is signed off', async () => {
    const { wo } = await brakeWithGuardWork('PB1');
    const detail = (await get(tech, `/work-orders/${wo.id}`).expect(200)).body;
    expect(detail.safetyCritical).toBe(true);
    expect(detail.checklist.map((l: { safetyCritical?: boolean }) => l.safetyCritical)).toEqual([true, true, true]);
    await failGuard(wo.id);

    const refused = await post(tech, `/work-orders/${wo.id}/close`, { password: DEMO_PASSWORD }).expect(409);
    expect(refused.body.message).toMatch(/Safety-critical check failed: Guard stops the beam when the test piece breaks it/);
    expect((await get(tech, `/work-orders/${wo.id}`).expect(200)).body.status).toBe('in-progress');

    const repair = (await post(tech, `/work-orders/${wo.id}/checklist/guard/repair`).expect(201)).body;
    const status = (await get(tech, '/machines/PB1/status').expect(200)).body;
    expect(status.state).toBe('out-of-service');
    expect(status.reason).toMatch(/Failed safety check: Guard stops the beam/);
    const line = (await get(tech, `/work-orders/${wo.id}`).expect(200)).body.checklist[0];
    expect(line.followUp).toMatchObject({ kind: 'repair', workOrderId: repair.id, number: repair.number });
    await post(tech, `/work-orders/${wo.id}/checklist/guard/repair`).expect(409); // not twice

    // Safety work is signed with the password: none → 400 on the field, a wrong one → 401, nothing signed.
    const before = await chainCount('safety-work-signed-off');
    expect((await post(tech, `/work-orders/${wo.id}/close`, {}).expect(400)).body.fields).toEqual([
      { path: 'password', message: 'Safety work is signed with your password: enter it to sign off' },
    ]);
    await post(tech, `/work-orders/${wo.id}/close`, { password: 'not-my-password' }).expect(401);
    expect(await chainCount('safety-work-signed-off')).toBe(before);
    expect((await get(tech, `/work-orders/${wo.id}`).expect(200)).body.status).toBe('in-progress');
    await post(tech, `/work-orders/${wo.id}/close`, { password: DEMO_PASSWORD }).expect(200);
    expect(await chainCount('safety-work-signed-off')).toBe(before + 1);

    // Signing off the guard test does not put the brake back: the repair does.
    expect((await get(tech, '/machines/PB1/status').expect(200)).body.state).toBe('out-of-service');
    await post(tech, `/work-orders/${repair.id}/close`, { password: DEMO_PASSWORD }).expect(200);
    expect((await get(tech, '/machines/PB1/status').expect(200)).body.state).toBe('in-service');
  });

  it('the safety officer may instead sign a justified deviation with the password; a technician may not', async () => {
    const { wo } = await brakeWithGuardWork('PB2');
    await failGuard(wo.id);
    const body = { justification: 'Brake runs in two-hand mode only until the curtain is replaced; setters briefed.', password: DEMO_PASSWORD };
    await post(tech, `/work-orders/${wo.id}/checklist/guard/deviation`, body).expect(403);
    const before = await chainCount('deviation-accepted');
    await post(safety, `/work-orders/${wo.id}/checklist/guard/deviation`, { ...body, password: 'wrong-password' }).expect(401);
    expect(await chainCount('deviation-accepted')).toBe(before);
    const short = await post(safety, `/work-orders/${wo.id}/checklist/guard/deviation`, { ...body, justification: 'ok' }).expect(400);
    expect(short.body.fields[0].path).toBe('justification');
    await post(safety, `/work-orders/${wo.id}/checklist/estops/deviation`, body).expect(409); // that line passed
    await post(safety, `/work-orders/${wo.id}/checklist/guard/deviation`, body).expect(201);
    expect(await chainCount('deviation-accepted')).toBe(before + 1);
    const line = (await get(tech, `/work-orders/${wo.id}`).expect(200)).body.checklist[0];
    expect(line.followUp).toMatchObject({ kind: 'deviation', justification: body.justification });
    expect((await get(tech, '/machines/PB2/status').expect(200)).body.state).toBe('in-service');
    await post(tech, `/work-orders/${wo.id}/close`, { password: DEMO_PASSWORD }).expect(200);
  });
});
