// Seeds the demo shop once (a second run leaves existing data alone).
import { initORM, closeORM } from '../server/db';
import { seedDemo } from './demo';
import { loadConfig } from '../server/config';

const orm = await initORM();
try {
  const created = await seedDemo(orm.em.fork(), { appUrl: loadConfig().APP_URL });
  console.log(created ? 'Demo shop seeded' : 'Demo shop already present');
} catch (err) {
  console.error('Seeding failed:', err instanceof Error ? err.message : err);
  process.exitCode = 1;
} finally {
  await closeORM();
}
