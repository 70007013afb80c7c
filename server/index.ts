import '../shared/luxon-clock';
import { loadConfig } from './config';
import { initORM, closeORM } from './db';
import { createApp } from './app';
import { migrate } from './migrate';
import { FakeSmtp } from './mail/fake-smtp';
import { createTransport } from './mail/transport';
import { startOutboxSender } from './mail/sender';
import { startScheduler } from './jobs/scheduler';
import { registerJobSteps } from './jobs/register';
import { logger } from './logger';

async function main() {
  const config = loadConfig();
  // Migrations run as the owner role; the server itself connects as the app role.
  const applied = await migrate(config.DATABASE_URL, config.MIGRATION_DATABASE_URL);
  if (applied.length) logger.info({ migrations: applied }, 'migrations applied');
  const orm = await initORM(config.DATABASE_URL);

  const smtp = config.MAIL_CAPTURE ? new FakeSmtp(config.SMTP_PORT) : null;
  if (smtp) await smtp.start();
  const transport = createTransport(config);
  const stopSender = startOutboxSender(orm, transport, config.MAIL_FROM, 3_000, (msg, err) => (err ? logger.warn({ err }, msg) : logger.info(msg)));
  registerJobSteps(config);
  const task = startScheduler(orm, config.JOB_SCHEDULE);

  const { app, close } = createApp({ orm, config, smtp });
  const server = app.listen(config.PORT, config.HOST, () => {
    console.log(`\nKerfbook is running at ${config.APP_URL}`);
    if (smtp) console.log(`Dev inbox (captured e-mail): ${config.APP_URL}/dev/inbox   (fake SMTP on 127.0.0.1:${config.SMTP_PORT})`);
    console.log('Demo sign-ins (demo only, password kerfbook-demo):');
    for (const who of ['admin', 'safety', 'tech', 'operator']) console.log(`  ${who}@alder-row.example`);
    console.log('  admin@birch-yard.example (a second shop)\nPress Ctrl-C to stop.\n');
  });

  let stopping = false;
  const shutdown = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'shutting down');
    // A request that never ends must not keep the process from stopping.
    setTimeout(() => {
      logger.error('shutdown took longer than 30 s; exiting');
      process.exit(1);
    }, 30_000).unref();
    // Stop accepting; in-flight requests finish. Keep-alive sockets close as soon as they are idle.
    const closed = new Promise<void>((resolve) => server.close(() => resolve()));
    server.closeIdleConnections();
    const idleSweep = setInterval(() => server.closeIdleConnections(), 100);
    let exitCode = 0;
    const step = async (name: string, fn: () => Promise<unknown> | unknown) => {
      try {
        await fn();
      } catch (err) {
        exitCode = 1;
        logger.error({ err, step: name }, 'shutdown step failed');
      }
    };
    await step('scheduler', () => task.stop());
    await step('outbox sender', () => stopSender());
    await closed;
    clearInterval(idleSweep);
    await step('session pool', () => close());
    await step('fake smtp', () => smtp?.stop());
    await step('database pool', () => closeORM());
    logger.info({ exitCode }, 'stopped');
    process.exit(exitCode);
  };
  process.on('SIGINT', () => void shutdown('SIGINT'));
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
  // A rejected promise that nothing awaited (e.g. a lost connection surfacing late) is logged;
  // it must not take down the requests of every other user.
  process.on('unhandledRejection', (reason) => logger.error({ err: reason }, 'unhandled promise rejection'));
}

main().catch((err) => {
  console.error('Kerfbook failed to start:', err instanceof Error ? err.message : err);
  process.exit(1);
});
