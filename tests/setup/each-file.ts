import '../../shared/luxon-clock';
import { afterAll } from 'vitest';
import { closeORM } from '../../server/db';

afterAll(async () => {
  await closeORM();
});
