import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { anonymous, get, makeShop, makeTestApp, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { ERROR_CODES } from '../../shared/schemas/common';

/** Clients branch on the `error` code of an answer, never on its wording: each kind keeps its code. */
let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;
let tech: SignedIn;
let op: SignedIn;

beforeAll(async () => {
  t = await makeTestApp({ LOGIN_LIMIT_PER_ACCOUNT: '2' });
  shop = await makeShop(t.em(), 'codes');
  tech = await signIn(t.app, shop.users.technician.email);
  op = await signIn(t.app, shop.users.operator.email);
});
afterAll(() => t.close());

const machine = (code: string) => ({ code, name: `Machine ${code}`, kind: 'plasma-table' });

describe('error codes', () => {
  it('names schema problems validation_failed, with the exact field paths', async () => {
    const res = await post(tech, '/machines', { code: '', name: 'No code', kind: 'not-a-kind' }).expect(400);
    expect(res.body.error).toBe('validation_failed');
    expect(new Set(res.body.fields.map((f: { path: string }) => f.path))).toEqual(new Set(['code', 'kind']));
    expect(res.body.message).toMatch(/^Please check /);
  });

  it('names a missing or wrong CSRF token csrf_invalid, and a refused role forbidden', async () => {
    const missing = await tech.agent.post('/api/machines').send(machine('X1')).expect(403);
    expect(missing.body).toMatchObject({ error: 'csrf_invalid', message: expect.stringMatching(/Missing CSRF token/) });
    const wrong = await tech.agent.post('/api/machines').set('X-CSRF-Token', 'not-the-token').send(machine('X1')).expect(403);
    expect(wrong.body).toEqual({ error: 'csrf_invalid', message: 'Invalid CSRF token' });
    const role = await post(op, '/machines', machine('X1')).expect(403);
    expect(role.body).toEqual({ error: 'forbidden', message: 'Your role does not allow this' });
  });

  it('names no session unauthorized, an unknown record not_found and a taken code conflict', async () => {
    const nobody = await anonymous(t.app);
    expect((await get(nobody, '/machines').expect(401)).body).toEqual({ error: 'unauthorized', message: 'Sign in first' });
    expect((await get(tech, `/machines/${randomUUID()}`).expect(404)).body.error).toBe('not_found');
    await post(tech, '/machines', machine('DUP')).expect(201);
    const taken = await post(tech, '/machines', machine('DUP')).expect(409);
    expect(taken.body).toMatchObject({ error: 'conflict', fields: [{ path: 'code', message: 'Code DUP is taken' }] });
  });

  it('names unreadable JSON invalid_json and an oversized body payload_too_large', async () => {
    const broken = await tech.agent.post('/api/machines').set('X-CSRF-Token', tech.csrf).set('Content-Type', 'application/json').send('{"code": ').expect(400);
    expect(broken.body).toEqual({ error: 'invalid_json', message: 'The request body is not valid JSON' });
    const huge = await post(tech, '/machines', { ...machine('BIG'), notes: 'x'.repeat(1_100_000) }).expect(413);
    expect(huge.body).toEqual({ error: 'payload_too_large', message: 'The request body is too large' });
  });

  it('names too many failed sign-ins rate_limited', async () => {
    const { agent, csrf } = await anonymous(t.app);
    const email = shop.users.safety.email;
    for (let i = 0; i < 2; i++) await agent.post('/api/auth/login').set('X-CSRF-Token', csrf).send({ email, password: 'wrong-password' }).expect(401);
    const blocked = await agent.post('/api/auth/login').set('X-CSRF-Token', csrf).send({ email, password: 'wrong-password' }).expect(429);
    expect(blocked.body.error).toBe('rate_limited');
  });

  it('answers only with codes from the published list', async () => {
    const nobody = await anonymous(t.app);
    const answers = await Promise.all([get(nobody, '/machines'), get(tech, '/no-such-route'), post(tech, '/machines', {})]);
    for (const a of answers) expect(ERROR_CODES).toContain(a.body.error);
  });
});
