import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { MeterReading } from '../../server/modules/meters/meter.entity';

// A file far larger than a hand-made one goes through the streamed path end to end:
// upload to disk, chunked parse, COPY into staging, SQL checks, one insert.
const ROWS = 200_000;
const BAD_LINE = 100_001; // the middle of the file (line 1 is the header)
const LARGE_TIMEOUT = 300_000;

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;
let tech: SignedIn;

const upload = (url: string, csv: Buffer) =>
  tech.agent
    .post(`/api${url}`)
    .set('X-CSRF-Token', tech.csrf)
    .set('Accept', 'application/json')
    .attach('file', csv, { filename: 'counters.csv', contentType: 'text/csv' });

async function readingCount() {
  const em = t.em();
  em.setFilterParams('org', { orgId: shop.orgId });
  return em.count(MeterReading, {});
}

/** Two meters, one reading a minute each from 2025-01-01; `backwardsAt` gets a count lower than the one before. */
function largeCsv(backwardsAt: number | null): Buffer {
  const lines = ['machine_code,meter_code,read_at,value,reset'];
  const start = Date.UTC(2025, 0, 1);
  for (let i = 0; i < ROWS; i++) {
    const line = i + 2;
    const half = i < ROWS / 2;
    const n = half ? i : i - ROWS / 2;
    const value = line === backwardsAt ? 3 : 1000 + n * 4;
    lines.push(`L1-T,${half ? 'arc-starts' : 'arc-hours'},${new Date(start + n * 60_000).toISOString()},${value},no`);
  }
  return Buffer.from(`${lines.join('\n')}\n`);
}

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeShop(t.em(), 'imp-large');
  tech = await signIn(t.app, shop.users.technician.email);
  const torch = (await post(tech, '/machines', { code: 'L1-T', name: 'Large torch', kind: 'torch' }).expect(201)).body.id;
  await post(tech, '/meters', { machineId: torch, code: 'arc-starts', name: 'Arc starts', kind: 'count', unit: 'starts' }).expect(201);
  await post(tech, '/meters', { machineId: torch, code: 'arc-hours', name: 'Arc hours', kind: 'running-time', unit: 'h' }).expect(201);
});
afterAll(() => t.close());

describe('counter import of a large file', () => {
  it('reads a file in chunks as one parse of the whole text would: quotes and CRLF across chunk edges, an unclosed quote at the end', async () => {
    const rows = 20_000; // ≈ 1.2 MB, several read chunks
    const lines = ['"machine_code","meter_code","read_at","value","reset"'];
    for (let i = 0; i < rows; i++) lines.push(`"L1-T","arc-starts","${new Date(Date.UTC(2024, 0, 1) + i * 60_000).toISOString()}","${1000 + i}","no"`);
    lines.push('L1-T,"arc-starts,2024-03-01T00:00:00Z,99999,no');
    const res = await upload('/counter-import/preview', Buffer.from(lines.join('\r\n'))).expect(200);
    expect(res.body).toMatchObject({ rows: rows + 1, toAdd: rows, duplicates: 0, errorCount: 1 });
    expect(res.body.errors).toEqual([{ line: rows + 2, column: null, message: 'Not valid CSV: Quoted field unterminated' }]);
    expect(res.body.meters).toEqual([
      {
        machineCode: 'L1-T',
        meterCode: 'arc-starts',
        unit: 'starts',
        rows,
        from: '2024-01-01T00:00:00.000Z',
        to: new Date(Date.UTC(2024, 0, 1) + (rows - 1) * 60_000).toISOString(),
      },
    ]);
  });

  it('refuses the whole file for one backwards count in the middle, naming its line', { timeout: LARGE_TIMEOUT }, async () => {
    const res = await upload('/counter-import', largeCsv(BAD_LINE)).expect(400);
    expect(res.body.message).toMatch(
      /^1 problem in the file; nothing was imported\. First: line 100001: L1-T\/arc-starts: 3 starts is lower than the reading before it/,
    );
    expect(res.body.fields).toEqual([
      {
        path: `line ${BAD_LINE} value`,
        message: expect.stringMatching(/^L1-T\/arc-starts: 3 starts is lower than the reading before it \(400,992 starts on /),
      },
    ]);
    expect(await readingCount()).toBe(0);
  });

  it(`imports ${ROWS.toLocaleString('en-US')} rows, and the same file again adds nothing`, { timeout: LARGE_TIMEOUT }, async () => {
    const file = largeCsv(null);
    const first = await upload('/counter-import', file).expect(200);
    expect(first.body).toEqual({ rows: ROWS, added: ROWS, duplicates: 0 });
    expect(await readingCount()).toBe(ROWS);
    const again = await upload('/counter-import', file).expect(200);
    expect(again.body).toEqual({ rows: ROWS, added: 0, duplicates: ROWS });
    expect(await readingCount()).toBe(ROWS);
  });
});
