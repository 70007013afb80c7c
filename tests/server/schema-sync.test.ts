import { describe, it, expect } from 'vitest';
import { MikroORM } from '@mikro-orm/postgresql';
import { createOrmConfig } from '../../server/mikro-orm.config';
import { ownerUrlFor } from '../../server/db-roles';

describe('migrations', () => {
  it('bring the database exactly to what the entities describe (no drift)', async () => {
    // As the owner, which runs the migrations: PostgreSQL's information_schema shows check
    // constraints only to the tables' owner, so the app role would see them as missing.
    const orm = await MikroORM.init({ ...createOrmConfig(ownerUrlFor(process.env.DATABASE_URL!)), pool: { min: 0, max: 1 } });
    try {
      const diff = await orm.schema.getUpdateSchemaSQL({ wrap: false, safe: false, dropTables: true });
      expect(diff.trim(), `entities and migrations differ; write a migration for:\n${diff}`).toBe('');
    } finally {
      await orm.close(true);
    }
  });
});
