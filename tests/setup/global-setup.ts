// Brings up the private PostgreSQL cluster, empties the test database and migrates it as the
// owner role (the tests, like the server, then connect as the app role).
import { execFileSync } from 'node:child_process';
import { register } from 'tsx/esm/api';

export default async function setup() {
  execFileSync('bash', ['scripts/db.sh', 'start'], { stdio: 'inherit' });
  register(); // umzug imports the .ts migrations with Node's own import()
  const pg = (await import('pg')).default;
  const { ownerUrlFor } = await import('../../server/db-roles');
  const client = new pg.Client({ connectionString: ownerUrlFor(process.env.DATABASE_URL!) });
  await client.connect();
  await client.query('drop schema if exists public cascade; create schema public;');
  await client.end();
  const { migrate } = await import('../../scripts/migrate');
  await migrate(process.env.DATABASE_URL);
}
