// Applies pending migrations to DATABASE_URL (used by npm start and the test setup).
import { initORM, closeORM } from '../server/db';

export async function migrate(databaseUrl?: string): Promise<string[]> {
  const orm = await initORM(databaseUrl);
  const applied = await orm.getMigrator().up();
  return applied.map((m) => m.name);
}

if (import.meta.url === `file://${process.argv[1]}`) {
  migrate()
    .then((names) => {
      console.log(names.length ? `Applied migrations: ${names.join(', ')}` : 'Database schema is up to date');
      return closeORM();
    })
    .catch((err) => {
      console.error('Migration failed:', err instanceof Error ? err.message : err);
      process.exit(1);
    });
}
