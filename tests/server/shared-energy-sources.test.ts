// Shared isolation points: one energy source (a hydraulic unit's pressure line) that feeds several machines.
import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import { makeTestApp } from '../setup/test-app';
import { readPdf } from '../setup/pdf';
import { approvedProcedure, cellProcedure, countSignOffs, get, makeSafetyShop, PASSWORD, post, put, shopToday, type SafetyShop } from './safety-helpers';
import { Machine } from '../../server/modules/machines/machine.entity';
import { setClock } from '../../shared/clock';
import { WORK_CAUTION } from '../../shared/domain/cautions';
import type { EnergySource, ProcedureContent } from '../../shared/schemas/safety-procedures';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let other: SafetyShop;
const ids: Record<string, string> = {};
let hydProc: string;

const supply = (feeds?: string[]): EnergySource => ({
  key: 'H1-E2',
  kind: 'hydraulic',
  description: 'Accumulator and pressure line to the cells',
  magnitude: '210 bar',
  isolationDevice: 'Lockable supply valve V12; dump valve V11',
  location: 'Accumulator block on the hydraulic unit',
  relieveMethod: 'Close V12, then open V11 until PG1 reads 0 bar',
  verifyMethod: 'PG1 reads 0 bar',
  ...(feeds ? { feeds } : {}),
});

// The helper's cell names its ram hydraulics "H1", which is a machine code in this shop.
const cell = (title: string): ProcedureContent => {
  const c = cellProcedure(title);
  return { ...c, sources: c.sources.map((s) => (s.key === 'H1' ? { ...s, key: 'HY1' } : s)) };
};

const hydraulicProcedure = (feeds?: string[]): ProcedureContent => ({
  ...cell('Energy isolation of the hydraulic unit'),
  sources: [{ ...cell('x').sources[0], key: 'H1-E1', description: 'Pump motor' }, supply(feeds)],
});

const cellWithShared = (title: string): ProcedureContent => ({ ...cell(title), sources: [...cell(title).sources, supply()] });

async function procedureOf(machineId: string, content: ProcedureContent) {
  return (await post(shop.s.technician, '/safety/procedures', { ...content, machineId }).expect(201)).body.id as string;
}

const mails = async (orgId: string, kind: string) =>
  (await t
    .em()
    .execute<{ to_address: string; subject: string; text_body: string }[]>(
      `select to_address, subject, text_body from outbox_mail where organization_id = ? and kind = ? order by created_at, to_address`,
      [orgId, kind],
    )) as { to_address: string; subject: string; text_body: string }[];

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'shared-pt');
  other = await makeSafetyShop(t.app, t.em(), 'shared-pt-other');
  const em = t.em();
  for (const [code, kind, active] of [
    ['H1', 'hydraulic-unit', true],
    ['C2', 'punch-plasma-cell', true],
    ['OLD', 'punch-plasma-cell', false],
  ] as const) {
    const m = em.create(Machine, { organization: shop.orgId, kind, code, name: code === 'H1' ? 'Hydraulic unit' : `Cell ${code}`, active });
    await em.flush();
    ids[code] = m.id;
  }
  ids.C1 = shop.machineId;
});
afterEach(() => setClock(null));
afterAll(() => t.close());

describe('shared isolation points', () => {
  it('refuses a point that feeds a machine of another shop, its own machine or a deactivated one, naming the field', async () => {
    // OSHA 29 CFR 1910.147(c)(4)(ii)(B): the procedure names the means of isolating the energy; a point may only name real machines it supplies.
    const cases: [string[], string, RegExp][] = [
      [[ids.C1, other.machineId], 'sources.1.feeds.1', /does not have/],
      [[ids.H1], 'sources.1.feeds.0', /on H1 itself/],
      [[ids.OLD], 'sources.1.feeds.0', /OLD is deactivated/],
    ];
    for (const [feeds, path, message] of cases) {
      const res = await post(shop.s.technician, '/safety/procedures', { ...hydraulicProcedure(feeds), machineId: ids.H1 }).expect(400);
      expect(res.body.fields).toEqual([expect.objectContaining({ path, message: expect.stringMatching(message) })]);
    }
    // The same machine twice, or not an id: the shared schema names the field.
    const twice = await post(shop.s.technician, '/safety/procedures', { ...hydraulicProcedure([ids.C1, ids.C1]), machineId: ids.H1 }).expect(400);
    expect(twice.body.fields.map((f: { path: string }) => f.path)).toEqual(['sources.1.feeds.1']);
    const junk = await post(shop.s.technician, '/safety/procedures', { ...hydraulicProcedure(['not-an-id']), machineId: ids.H1 }).expect(400);
    expect(junk.body.fields.map((f: { path: string }) => f.path)).toEqual(['sources.1.feeds.0']);
    expect((await get(shop.s.safety, '/safety/procedures').expect(200)).body).toEqual([]);
  });

  it('refuses approval of a fed machine’s procedure without the shared point, records the refusal, and approves it with the point', async () => {
    hydProc = await approvedProcedure(shop, hydraulicProcedure([ids.C1, ids.C2]), ids.H1);
    const view = (await get(shop.s.operator, `/safety/procedures/${hydProc}`).expect(200)).body;
    expect(view.fedMachines).toEqual({ [ids.C1]: { code: 'C1', name: 'Cell 1' }, [ids.C2]: { code: 'C2', name: 'Cell C2' } });
    // The placard at the unit says which machines its point also feeds.
    const placard = await shop.s.operator.agent
      .get(`/api/safety/procedures/${hydProc}/placard.pdf`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect((await readPdf(placard.body as Buffer)).text.replace(/\s+/g, ' ')).toContain('Also feeds C1, C2: locking it locks them out too.');

    // OSHA 29 CFR 1910.147(d)(3): every energy isolating device needed to isolate C1 is in its procedure.
    const c1 = await procedureOf(ids.C1, cell('Cell 1 without the hydraulic supply'));
    const c1View = (await get(shop.s.safety, `/safety/procedures/${c1}`).expect(200)).body;
    expect(c1View.feedingPoints).toEqual([
      expect.objectContaining({ key: 'H1-E2', kind: 'hydraulic', fromMachine: { id: ids.H1, code: 'H1', name: 'Hydraulic unit' } }),
    ]);
    const signed = await countSignOffs(shop.orgId);
    const refused = await post(shop.s.safety, `/safety/procedures/${c1}/versions/1/approve`, { password: PASSWORD }).expect(409);
    expect(refused.body.message).toBe("H1-E2 (hydraulic unit H1) feeds C1; add it to this procedure's energy sources before approving");
    expect(refused.body.fields).toEqual([{ path: 'sources', message: 'Missing shared point H1-E2 from H1' }]);
    // Nothing was written: no signature, the draft is still a draft.
    expect(await countSignOffs(shop.orgId)).toBe(signed);
    expect((await get(shop.s.safety, `/safety/procedures/${c1}`).expect(200)).body.draft).toMatchObject({ version: 1, status: 'draft' });
    const events = (await get(shop.s.safety, `/safety/events?kind=refused&machineId=${ids.C1}`).expect(200)).body.rows;
    expect(events[0]).toMatchObject({ action: 'procedure.approve', reason: refused.body.message, machineCode: 'C1' });

    // With the point (same tag) the approval passes.
    await put(shop.s.technician, `/safety/procedures/${c1}/draft`, cellWithShared('Cell 1 with the hydraulic supply')).expect(200);
    await post(shop.s.safety, `/safety/procedures/${c1}/versions/1/approve`, { password: PASSWORD }).expect(201);
    expect(await countSignOffs(shop.orgId)).toBe(signed + 1);
  });

  it('a lock on the shared point marks the fed machines locked out, shows on their stations, mails their people, and clears on release', async () => {
    setClock('2027-03-10T14:20:00Z');
    // Who works a fed machine: the operator is trained (affected employee) on C2's procedure, the admin on C1's;
    // the safety officer holds authorized training on C2's; the technician applies the locks and is not mailed.
    const c2 = await approvedProcedure(shop, cellWithShared('Cell 2 with the hydraulic supply'), ids.C2);
    for (const [role, proc] of [
      ['operator', c2],
      ['admin', (await get(shop.s.safety, '/safety/procedures').expect(200)).body.find((p: { machineCode: string }) => p.machineCode === 'C1').id],
    ] as const) {
      await post(shop.s.safety, '/safety/training', {
        userId: shop.users[role].userId,
        procedureId: proc,
        kind: 'affected',
        trainedOn: shopToday(),
        password: PASSWORD,
      }).expect(201);
    }
    const before = await get(shop.s.operator, '/machines/C2/status').expect(200);
    expect(before.body.state).toBe('in-service');

    const applied = await post(shop.s.technician, '/safety/lockouts', {
      procedureId: hydProc,
      reason: 'Replace the pressure hose',
      points: [
        { sourceKey: 'H1-E1', device: 'lock-and-tag', lockNumber: 'SH-1' },
        { sourceKey: 'H1-E2', device: 'valve-cover', lockNumber: 'SH-2' },
      ],
      password: PASSWORD,
    }).expect(201);

    const d = (await get(shop.s.technician, `/safety/lockouts/${applied.body.id}`).expect(200)).body;
    expect(d.appliedAt).toMatch(/^2027-03-10T14:2/);
    for (const code of ['C1', 'C2']) {
      const st = (await get(shop.s.operator, `/machines/${code}/status`).expect(200)).body;
      expect(st).toMatchObject({ state: 'locked-out', reason: 'H1-E2 on H1 locked out: Replace the pressure hose', since: d.appliedAt });
      const station = (await get(shop.s.operator, `/stations/${code}`).expect(200)).body;
      expect(station.lockouts).toEqual([
        {
          id: applied.body.id,
          machineCode: 'H1',
          state: 'locked',
          appliedAt: d.appliedAt,
          reason: 'Replace the pressure hose',
          heldBy: `technician of ${shop.slug}`,
          sharedPoint: 'H1-E2',
        },
      ]);
    }
    // Another shop's cell of the same code is untouched.
    expect((await get(other.s.operator, '/machines/C1/status').expect(200)).body.state).toBe('in-service');

    // OSHA 29 CFR 1910.147(c)(9): the people who work the fed machines are told before and after.
    const locked = await mails(shop.orgId, 'shared-point-locked');
    expect(locked.map((m) => [m.to_address, m.subject])).toEqual([
      [shop.users.admin.email, 'C1 locked out through H1: Replace the pressure hose'],
      [shop.users.operator.email, 'C2 locked out through H1: Replace the pressure hose'],
      [shop.users.safety.email, 'C2 locked out through H1: Replace the pressure hose'],
    ]);
    expect(locked[1].text_body).toContain('C2 Cell C2: through H1-E2 on H1 hydraulic unit');
    // The caution every work mail carries.
    expect(locked[1].text_body).toContain(`Safety: ${WORK_CAUTION}`);

    await post(shop.s.technician, `/safety/lockouts/${applied.body.id}/release`, {
      areaChecked: true,
      peopleClear: true,
      affectedNotified: true,
      password: PASSWORD,
    }).expect(201);
    expect(d.points).toHaveLength(2);
    for (const code of ['C1', 'C2']) {
      expect((await get(shop.s.operator, `/machines/${code}/status`).expect(200)).body.state).toBe('in-service');
      expect((await get(shop.s.operator, `/stations/${code}`).expect(200)).body.lockouts).toEqual([]);
    }
    expect((await mails(shop.orgId, 'shared-point-released')).map((m) => m.to_address)).toEqual([
      shop.users.admin.email,
      shop.users.operator.email,
      shop.users.safety.email,
    ]);
  });
});
