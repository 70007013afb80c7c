import { describe, it, expect } from 'vitest';
import { initORM } from '../../server/db';

describe('migrations', () => {
  it('bring the database exactly to what the entities describe (no drift)', async () => {
    const orm = await initORM();
    const diff = await orm.schema.getUpdateSchemaSQL({ wrap: false, safe: false, dropTables: true });
    expect(diff.trim(), `entities and migrations differ; write a migration for:\n${diff}`).toBe('');
  });
});
