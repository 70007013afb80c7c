import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { MeterReading } from '../../server/modules/meters/meter.entity';
import { COUNTER_IMPORT_MAX_BYTES } from '../../shared/schemas/counter-import';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;
let tech: SignedIn;
let otherTech: SignedIn;
let startsId: string;

const upload = (s: SignedIn, url: string, csv: string | Buffer, accept = 'application/json') =>
  s.agent
    .post(`/api${url}`)
    .set('X-CSRF-Token', s.csrf)
    .set('Accept', accept)
    .attach('file', Buffer.isBuffer(csv) ? csv : Buffer.from(csv), { filename: 'counters.csv', contentType: 'text/csv' });

async function readingCount(orgId: string) {
  const em = t.em();
  em.setFilterParams('org', { orgId });
  return em.count(MeterReading, {});
}

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'imp-a');
  b = await makeShop(t.em(), 'imp-b');
  tech = await signIn(t.app, a.users.technician.email);
  otherTech = await signIn(t.app, b.users.technician.email);
  const torch = (await post(tech, '/machines', { code: 'C1-T', name: 'Torch 1', kind: 'torch' }).expect(201)).body.id;
  startsId = (await post(tech, '/meters', { machineId: torch, code: 'arc-starts', name: 'Arc starts', kind: 'count', unit: 'starts' }).expect(201)).body.id;
  await post(tech, '/meters', { machineId: torch, code: 'arc-hours', name: 'Arc hours', kind: 'running-time', unit: 'h' }).expect(201);
  await post(tech, '/meters', { machineId: torch, code: 'filter-dp', name: 'Pressure drop', kind: 'condition', unit: 'Pa' }).expect(201);
});
afterAll(() => t.close());

const GOOD = [
  'machine_code,meter_code,read_at,value,reset',
  'C1-T,arc-starts,2026-02-01T06:00:00Z,1000,no',
  'C1-T,arc-starts,2026-02-02T06:00:00Z,1450,',
  'C1-T,arc-hours,2026-02-02 06:00,12.5,no', // no offset: the shop's zone (America/Chicago)
  'c1-t,ARC-STARTS,2026-02-03T06:00:00+01:00,1800,no', // codes are not case-sensitive
  'C1-T,filter-dp,2026-02-03T06:00:00Z,820,',
  'C1-T,filter-dp,2026-02-04T06:00:00Z,640,', // condition readings may fall
  'C1-T,arc-starts,2026-02-05T06:00:00Z,40,yes', // a reset
].join('\n');

describe('counter import', () => {
  it('serves a template whose columns it accepts', async () => {
    const res = await tech.agent.get('/api/counter-import/template').expect(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="?kerfbook-counter-import.csv"?/);
    expect(res.text.split('\r\n')[0]).toBe('machine_code,meter_code,read_at,value,reset,unit');
    const preview = await upload(tech, '/counter-import/preview', res.text).expect(200);
    expect(preview.body.errorCount).toBe(0);
  });

  it('previews a file without writing anything', async () => {
    const res = await upload(tech, '/counter-import/preview', GOOD).expect(200);
    expect(res.body).toMatchObject({ rows: 7, toAdd: 7, duplicates: 0, errorCount: 0 });
    expect(res.body.columns.map((c: { column: string }) => c.column)).toEqual(['machine_code', 'meter_code', 'read_at', 'value', 'reset']);
    expect(res.body.meters.map((m: { meterCode: string; rows: number }) => `${m.meterCode}:${m.rows}`).sort()).toEqual([
      'arc-hours:1',
      'arc-starts:4',
      'filter-dp:2',
    ]);
    // 06:00 wall clock in Chicago in February (CST, UTC−6) is 12:00 UTC.
    expect(res.body.sample.find((r: { meterCode: string }) => r.meterCode === 'arc-hours').readAt).toBe('2026-02-02T12:00:00.000Z');
    expect(await readingCount(a.orgId)).toBe(0);
  });

  it('imports the file, and importing it again adds nothing', async () => {
    const first = await upload(tech, '/counter-import', GOOD).expect(200);
    expect(first.body).toEqual({ rows: 7, added: 7, duplicates: 0 });
    expect(await readingCount(a.orgId)).toBe(7);
    const again = await upload(tech, '/counter-import', GOOD).expect(200);
    expect(again.body).toEqual({ rows: 7, added: 0, duplicates: 7 });
    expect(await readingCount(a.orgId)).toBe(7);
    const latest = await tech.agent.get(`/api/meters/${startsId}`).expect(200);
    expect(latest.body.latest).toMatchObject({ value: 40, isReset: true });
  });

  it('refuses missing and extra columns before reading rows', async () => {
    const missing = await upload(tech, '/counter-import/preview', 'machine_code,meter_code,value\nC1-T,arc-starts,5\n').expect(400);
    expect(missing.body.message).toMatch(/Missing column “read_at”/);
    expect(missing.body.fields[0].path).toBe('file');
    const extra = await upload(tech, '/counter-import', 'machine_code,meter_code,read_at,value,operator\nC1-T,arc-starts,2026-02-06T06:00:00Z,99,x\n').expect(
      400,
    );
    expect(extra.body.message).toMatch(/Unknown column “operator”/);
    const empty = await upload(tech, '/counter-import/preview', '').expect(400);
    expect(empty.body.message).toMatch(/empty|Choose a CSV/);
  });

  it('lists every bad row by line and column, and refuses the whole file on import', async () => {
    const csv = [
      'machine_code,meter_code,read_at,value,reset,unit',
      'C1-T,arc-starts,2026-03-01T06:00:00Z,5000,no,starts', // line 2 fine
      'C1-T,arc-starts,14/03/2026,5100,no,starts', // line 3 bad date
      'C1-T,arc-hours,2026-03-01T06:00:00Z,1.5,no,starts', // line 4 wrong unit
      'C9,arc-starts,2026-03-01T06:00:00Z,1,no,', // line 5 unknown machine
      'C1-T,arc-starts,2026-03-02T06:00:00Z,4000,no,', // line 6 backwards
      'C1-T,arc-starts,2026-03-03T06:00:00Z,"1,200",no,', // line 7 thousands separator
      'C1-T,arc-starts,2026-03-04T06:00:00Z,6000,maybe,', // line 8 bad reset
      'C1-T,nope,2026-03-04T06:00:00Z,6000,no,', // line 9 unknown meter
    ].join('\n');
    const before = await readingCount(a.orgId);
    const preview = await upload(tech, '/counter-import/preview', csv).expect(200);
    expect(preview.body.errors.map((e: { line: number; column: string }) => `${e.line}:${e.column}`)).toEqual([
      '3:read_at',
      '4:unit',
      '5:machine_code',
      '6:value',
      '7:value',
      '8:reset',
      '9:meter_code',
    ]);
    expect(preview.body.errors[0].message).toBe('“14/03/2026” is not a date-time; write e.g. 2026-03-14T07:30:00Z or 2026-03-14 07:30');
    expect(preview.body.errors[1].message).toBe('Unit “starts” does not match meter C1-T/arc-hours, which counts in h');
    expect(preview.body.errors[3].message).toMatch(/4,000 starts is lower than the reading before it \(5,000 starts/);
    const commit = await upload(tech, '/counter-import', csv).expect(400);
    expect(commit.body.message).toMatch(/^7 problems in the file; nothing was imported/);
    expect(commit.body.fields[0]).toEqual({ path: 'line 3 read_at', message: preview.body.errors[0].message });
    expect(await readingCount(a.orgId)).toBe(before);
  });

  it('skips a line repeated in the file and a reading already typed in by hand, marking them in the sample', async () => {
    const typed = await post(tech, `/meters/${startsId}/readings`, { value: 7000, readAt: '2026-04-02T06:00:00Z' }).expect(201);
    expect(typed.body).toBeTruthy();
    const csv = [
      'machine_code,meter_code,read_at,value',
      'C1-T,arc-starts,2026-04-01T06:00:00Z,6500', // line 2: new
      'C1-T,arc-starts,2026-04-01T06:00:00Z,6500', // line 3: repeats line 2
      'C1-T,arc-starts,2026-04-02T06:00:00Z,7000', // line 4: the typed reading
      'C1-T,arc-starts,2026-04-03T06:00:00Z,7600', // line 5: new
    ].join('\n');
    const before = await readingCount(a.orgId);
    const preview = await upload(tech, '/counter-import/preview', csv).expect(200);
    expect(preview.body).toMatchObject({ rows: 4, toAdd: 2, duplicates: 2, errorCount: 0 });
    expect(preview.body.sample.map((r: { line: number; status: string }) => `${r.line}:${r.status}`)).toEqual(['2:add', '3:duplicate', '4:duplicate', '5:add']);
    expect(preview.body.meters).toEqual([
      { machineCode: 'C1-T', meterCode: 'arc-starts', unit: 'starts', rows: 4, from: '2026-04-01T06:00:00.000Z', to: '2026-04-03T06:00:00.000Z' },
    ]);
    const done = await upload(tech, '/counter-import', csv).expect(200);
    expect(done.body).toEqual({ rows: 4, added: 2, duplicates: 2 });
    expect(await readingCount(a.orgId)).toBe(before + 2);
  });

  it('skips a reading typed in by hand when the rest of the file is new, and keeps the typed one', async () => {
    // No line repeats and nothing was imported before: the rows go straight into the readings and
    // the one equal to a typed reading is taken back out.
    await post(tech, `/meters/${startsId}/readings`, { value: 9100, readAt: '2026-05-02T06:00:00Z' }).expect(201);
    const csv = [
      'machine_code,meter_code,read_at,value',
      'C1-T,arc-starts,2026-05-01T06:00:00Z,9000',
      'C1-T,arc-starts,2026-05-02T06:00:00Z,9100', // the typed reading
      'C1-T,arc-starts,2026-05-03T06:00:00Z,9200',
    ].join('\n');
    const before = await readingCount(a.orgId);
    expect((await upload(tech, '/counter-import', csv).expect(200)).body).toEqual({ rows: 3, added: 2, duplicates: 1 });
    expect(await readingCount(a.orgId)).toBe(before + 2);
    const em = t.em();
    em.setFilterParams('org', { orgId: a.orgId });
    const may2 = await em.find(MeterReading, { meter: startsId, readAt: new Date('2026-05-02T06:00:00Z') });
    expect(may2.map((r) => r.source)).toEqual(['manual']);
  });

  it('refuses on import a reading higher than a stored one after it, and writes nothing', async () => {
    const before = await readingCount(a.orgId);
    const csv = 'machine_code,meter_code,read_at,value\nC1-T,arc-starts,2026-02-02T12:00:00Z,1500\nC1-T,arc-starts,2026-02-02T13:00:00Z,1900\n';
    const res = await upload(tech, '/counter-import', csv).expect(400);
    expect(res.body.message).toMatch(
      /^1 problem in the file; nothing was imported\. First: line 3: C1-T\/arc-starts: 1900 starts is higher than the stored reading after it/,
    );
    expect(await readingCount(a.orgId)).toBe(before);
  });

  it('refuses a reading lower than one already stored after it', async () => {
    const res = await upload(tech, '/counter-import/preview', 'machine_code,meter_code,read_at,value\nC1-T,arc-starts,2026-02-02T12:00:00Z,1900\n').expect(200);
    expect(res.body.errors[0].message).toMatch(/1900 starts is higher than the stored reading after it \(1800 starts on 2 Feb 2026, 23:00\)/);
    // Just before a reset, any higher count is fine: the counter started again after it.
    const ok = await upload(tech, '/counter-import/preview', 'machine_code,meter_code,read_at,value\nC1-T,arc-starts,2026-02-04T06:00:00Z,99999\n').expect(200);
    expect(ok.body.errorCount).toBe(0);
  });

  it('refuses a file over 50 MB with 413 and writes nothing', async () => {
    const big = Buffer.alloc(COUNTER_IMPORT_MAX_BYTES + 1, 'a');
    const res = await upload(tech, '/counter-import', big).expect(413);
    expect(res.body.message).toMatch(/larger than 50 MB/);
  });

  it('streams progress lines and the outcome as NDJSON when asked', async () => {
    const res = await upload(tech, '/counter-import/preview', GOOD, 'application/x-ndjson')
      .buffer(true)
      .parse((r, cb) => {
        let text = '';
        r.on('data', (c: Buffer) => (text += c.toString()));
        r.on('end', () => cb(null, text));
      })
      .expect(200);
    const lines = (res.body as string)
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l));
    expect(lines.some((l) => l.type === 'progress')).toBe(true);
    expect(lines.at(-1)).toMatchObject({ type: 'preview', preview: { rows: 7, duplicates: 7, toAdd: 0 } });
  });

  it("does not see another shop's machines", async () => {
    const res = await upload(otherTech, '/counter-import/preview', GOOD).expect(200);
    expect(res.body.errorCount).toBe(7);
    expect(res.body.errors[0].message).toBe('No machine with the code “C1-T” in this shop');
  });

  it('lets operators download the template but not import', async () => {
    const op = await signIn(t.app, a.users.operator.email);
    await op.agent.get('/api/counter-import/template').expect(200);
    await upload(op, '/counter-import', GOOD).expect(403);
  });
});
