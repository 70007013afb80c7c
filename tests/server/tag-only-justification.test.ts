// A tag used alone on an isolation point carries its reason, OSHA 29 CFR 1910.147(c)(3):
// (c)(3)(i) the isolating device cannot take a lock, or (c)(3)(ii) it can, and the tag with an
// additional safety measure ((c)(3)(iii), (c)(5)(ii)) gives full employee protection.
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeTestApp } from '../setup/test-app';
import { approvedProcedure, countSignOffs, get, lockPoints, makeSafetyShop, PASSWORD, post, type SafetyShop } from './safety-helpers';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let procId: string;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'tagonly');
  procId = await approvedProcedure(shop);
});
afterAll(() => t.close());

const prefix = () => `T${Math.random().toString(36).slice(2, 6)}`;
/** E1 lock and tag, H1 tag alone with the given reason, PL1 tag alone with the given reason. */
const points = (h1: Record<string, unknown>, pl1: Record<string, unknown>) => {
  const [e1, h, pl] = lockPoints(prefix());
  return [e1, { ...h, device: 'tag-only', ...h1 }, { ...pl, device: 'tag-only', ...pl1 }];
};
const apply = (pts: unknown[]) =>
  post(shop.s.technician, '/safety/lockouts', { procedureId: procId, reason: 'Change the ram seals', points: pts, password: PASSWORD });
const refusals = async () =>
  (await get(shop.s.safety, '/safety/events?kind=refused&pageSize=100').expect(200)).body.rows as { action: string; reason: string; personName: string }[];
const openLockouts = async () => (await get(shop.s.safety, '/safety/lockouts?state=open').expect(200)).body.total as number;

describe('tag-only points need their reason', () => {
  it('refuses a tag alone without a reason, names the field, writes nothing and audits the refusal (1910.147(c)(3))', async () => {
    const signed = await countSignOffs(shop.orgId);
    const open = await openLockouts();
    const audited = (await refusals()).length;
    const res = await apply(points({}, { tagJustification: 'cannot-take-lock' })).expect(400);
    expect(res.body.fields).toEqual([{ path: 'points.1.tagJustification', message: expect.stringMatching(/1910\.147\(c\)\(3\)\(i\)/) }]);
    // (c)(3)(ii) full protection with no additional measure named: refused on the measure field.
    const noMeasure = await apply(points({ tagJustification: 'full-protection', tagMeasure: ' ' }, { tagJustification: 'cannot-take-lock' })).expect(400);
    expect(noMeasure.body.fields.map((f: { path: string }) => f.path)).toEqual(['points.1.tagMeasure']);
    expect(await countSignOffs(shop.orgId)).toBe(signed);
    expect(await openLockouts()).toBe(open);
    const events = await refusals();
    expect(events.length).toBe(audited + 2);
    expect(events[0]).toMatchObject({ action: 'lockout.apply', personName: `technician of ${shop.slug}` });
    expect(events.map((e) => e.reason).join('\n')).toMatch(/points\.1\.tagJustification/);
  });

  it('signs both kinds of reason into the lockout-applied record, shows them on the lockout, and the chain verifies (1910.147(c)(3)(i), (c)(3)(ii))', async () => {
    const measure = 'Removal of an isolating circuit element: pump fuses F3 pulled and kept';
    const res = await apply(points({ tagJustification: 'full-protection', tagMeasure: measure }, { tagJustification: 'cannot-take-lock' })).expect(201);
    const d = (await get(shop.s.operator, `/safety/lockouts/${res.body.id}`).expect(200)).body;
    const byKey = Object.fromEntries(d.points.map((p: { sourceKey: string }) => [p.sourceKey, p]));
    expect(byKey.E1).toMatchObject({ device: 'lock-and-tag', tagJustification: null, tagMeasure: null });
    expect(byKey.H1).toMatchObject({ device: 'tag-only', tagJustification: 'full-protection', tagMeasure: measure });
    expect(byKey.PL1).toMatchObject({ device: 'tag-only', tagJustification: 'cannot-take-lock', tagMeasure: null });

    const rows = (await get(shop.s.safety, '/safety/sign-offs?meaning=lockout-applied&pageSize=5').expect(200)).body.rows;
    const mine = rows.find((r: { subjectId: string }) => r.subjectId === res.body.id);
    expect(mine.statement).toMatch(/Where a tag is used alone, the reason given beside it holds\./);
    expect(mine.summary).toContain(`H1 tag only ${byKey.H1.lockNumber} — full protection with ${measure} (1910.147(c)(3)(ii))`);
    expect(mine.summary).toContain(`PL1 tag only ${byKey.PL1.lockNumber} — cannot take a lock (1910.147(c)(3)(i))`);
    const chain = await get(shop.s.safety, '/safety/chain/verify').expect(200);
    expect(chain.body.ok).toBe(true);

    // A reason sent for a point with a lock is not kept: the reason belongs to tags used alone.
    const withLock = lockPoints(prefix()).map((p) => ({ ...p, tagJustification: 'cannot-take-lock' }));
    const locked = await apply(withLock).expect(201);
    const ld = (await get(shop.s.operator, `/safety/lockouts/${locked.body.id}`).expect(200)).body;
    expect(ld.points.every((p: { tagJustification: string | null }) => p.tagJustification === null)).toBe(true);
  });
});
