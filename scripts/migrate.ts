// npm run db:migrate: applies pending migrations as the owner role (MIGRATION_DATABASE_URL) and
// grants the app role (DATABASE_URL) its privileges. Also imported by the test setup and benches.
import { migrate } from '../server/migrate';

export { migrate };

if (import.meta.url === `file://${process.argv[1]}`) {
  migrate()
    .then((names) => console.log(names.length ? `Applied migrations: ${names.join(', ')}` : 'Database schema is up to date'))
    .catch((err) => {
      console.error('Migration failed:', err instanceof Error ? err.message : err);
      process.exit(1);
    });
}
