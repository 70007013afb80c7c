import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { anonymous, makeShop, makeTestApp, post, signIn, type TestShop } from '../setup/test-app';
import { RESET_ANSWER_MS } from '../../server/modules/auth/auth.service';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'privacy-a');
  b = await makeShop(t.em(), 'privacy-b');
});
afterAll(() => t.close());

const median = (xs: number[]) => [...xs].sort((x, y) => x - y)[Math.floor(xs.length / 2)];

describe('what an outsider can learn about accounts', () => {
  it('a password-reset request takes the same time whether or not the account exists', async () => {
    const anon = await anonymous(t.app);
    const timed = async (email: string) => {
      const started = performance.now();
      await post(anon, '/auth/request-reset', { email }).expect(200);
      return performance.now() - started;
    };
    const known: number[] = [];
    const unknown: number[] = [];
    for (let i = 0; i < 4; i++) {
      known.push(await timed(a.users.operator.email));
      unknown.push(await timed(`nobody-${i}@${a.slug}.example`));
    }
    // Every answer waits for the same floor, far above the work either path does.
    for (const ms of [...known, ...unknown]) expect(ms).toBeGreaterThanOrEqual(RESET_ANSWER_MS - 5);
    expect(Math.abs(median(known) - median(unknown))).toBeLessThan(RESET_ANSWER_MS / 4);
  });

  it('an invitation does not reveal that an address belongs to another shop', async () => {
    const adminA = await signIn(t.app, a.users.admin.email);
    const elsewhere = await post(adminA, '/users', { name: 'Someone Else', email: b.users.technician.email, role: 'operator' });
    expect(elsewhere.status).toBe(409);
    expect(JSON.stringify(elsewhere.body)).not.toMatch(/shop|account/i);
    expect(elsewhere.body.fields).toEqual([{ path: 'email', message: 'This address cannot be invited' }]);
    // A member of the admin's own shop is the admin's business, and is named as such.
    const member = await post(adminA, '/users', { name: 'Tech', email: a.users.technician.email, role: 'operator' }).expect(409);
    expect(member.body.fields).toEqual([{ path: 'email', message: 'Already a member' }]);
  });
});
