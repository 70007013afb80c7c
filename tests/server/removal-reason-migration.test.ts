import { describe, it, expect, afterAll, beforeAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { MikroORM } from '@mikro-orm/postgresql';
import { createOrmConfig } from '../../server/mikro-orm.config';
import { Migration20261205104001 } from '../../migrations/Migration20261205104001';
import { reasonsFromSingle } from '../../shared/domain/consumables';
import type { ChangeReason } from '../../shared/schemas/consumables';
import type { TorchCategory } from '../../shared/schemas/stock';

let orm: MikroORM;
beforeAll(async () => {
  orm = await MikroORM.init({ ...createOrmConfig(process.env.DATABASE_URL!), pool: { min: 0, max: 1 } });
});
afterAll(() => orm.close(true));

/** The data step of the migration (one reason per change → a reason per part), as SQL text. */
function dataStep(): string {
  const m = new Migration20261205104001(orm.em.getDriver(), orm.config);
  // up() only collects statements; nothing runs here.
  void m.up();
  const sql = m.getQueries().map((q) => String(q));
  return sql.find((s) => s.includes('with parts as'))!;
}

describe('moving older changes to a reason per part', () => {
  it('gives the change reason to the lead part and "with its partner" to the others, as reasonsFromSingle does', async () => {
    const cases: [ChangeReason, TorchCategory[]][] = [
      ['normal-wear', ['electrode', 'nozzle']],
      ['poor-cut', ['electrode', 'nozzle']],
      ['poor-cut', ['electrode', 'swirl-ring']],
      ['failed-start', ['electrode', 'nozzle', 'swirl-ring']],
      ['damaged', ['shield', 'nozzle']],
      ['preventive', ['electrode', 'nozzle', 'shield']],
      ['normal-wear', ['retaining-cap']],
    ];
    const conn = orm.em.getConnection();
    // Temporary tables of the same names shadow the real ones for this session only.
    await conn.execute('begin');
    try {
      await conn.execute('create temp table "consumable_change" (id uuid primary key, reason text not null)');
      await conn.execute('create temp table "consumable_install" (id uuid primary key, category text not null, removal_change_id uuid, removal_reason text)');
      const expected = new Map<string, string>();
      for (const [reason, cats] of cases) {
        const changeId = randomUUID();
        await conn.execute('insert into "consumable_change" values (?, ?)', [changeId, reason]);
        const want = reasonsFromSingle(cats, reason);
        for (const c of cats) {
          const id = randomUUID();
          await conn.execute('insert into "consumable_install" values (?, ?, ?, ?)', [id, c, changeId, reason]);
          expected.set(id, want[c]!);
        }
      }
      await conn.execute(dataStep());
      const rows: { id: string; removal_reason: string }[] = await conn.execute('select id, removal_reason from "consumable_install"');
      expect(rows).toHaveLength(expected.size);
      for (const r of rows) expect(r.removal_reason, r.id).toBe(expected.get(r.id));
      expect(rows.filter((r) => r.removal_reason === 'with-partner')).toHaveLength(6);
      expect(rows.filter((r) => r.removal_reason === 'worn')).toHaveLength(2);
    } finally {
      await conn.execute('rollback');
    }
  });
});
