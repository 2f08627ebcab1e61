import 'reflect-metadata';
import { createApp } from './app/create-app';
import { AppLogger } from './common/logging/app-logger';
import { ConfigError, loadConfig } from './config/config';
import { openDatabase } from './database';
import { DEMO_SIGN_INS, seedDemo } from './demo/seed';

async function main(): Promise<void> {
  const config = loadConfig(process.env);
  const logger = new AppLogger(config.logLevel);
  const database = await openDatabase({
    databaseUrl: config.databaseUrl,
    dataDir: config.dataDir,
    migrationsDir: config.migrationsDir,
    applyMigrations: true,
    logger: { log: (m: string) => logger.log(m, 'database'), warn: (m: string) => logger.warn(m, 'database') },
  });
  const where = database.kind === 'embedded' ? `embedded database in ${config.dataDir}` : 'PostgreSQL server';
  const seeded = config.demo && (await seedDemo(database.prisma)) === 'seeded';
  if (seeded) logger.log('Seeded the invented demo shops "Kestrel Row Motor Works" and "Fennick Yard Auto Electric".', 'demo');
  const app = await createApp(config, database, logger);
  // Our own signal handlers (not Nest's shutdown hooks, which close the application but not the database and then
  // re-raise the signal): close the application, then the database, so the embedded database's lock is released.
  stopOnSignals(async () => {
    await app.close();
    await database.close();
  }, logger);
  await app.listen(config.port, config.host);
  const url = `http://${config.host === '0.0.0.0' ? '127.0.0.1' : config.host}:${config.port}`;
  const lines = [
    '',
    `Tracebay is running on the ${where}.`,
    `  Bay tablet:  ${url}/`,
    `  API docs:    ${url}/api/docs  (every endpoint, try it out; the OpenAPI document is ${url}/api/openapi.json)`,
    `  Health:      ${url}/api/health`,
  ];
  if (seeded) {
    // Printed once, when the demo was seeded: invented people of two invented shops, to try sign-in and isolation.
    lines.push('  Demo sign-ins (invented people; each shop sees only its own work):');
    for (const u of DEMO_SIGN_INS) lines.push(`    ${u.shop.padEnd(28)} ${u.role.padEnd(10)} ${u.email.padEnd(28)} password: ${u.password}`);
  } else if (config.demo) {
    lines.push('  Demo shops were seeded on an earlier start; their sign-ins are listed in the README.');
  }
  lines.push('Stop with Ctrl+C.', '');
  process.stdout.write(lines.join('\n') + '\n');
}

const SIGNALS: NodeJS.Signals[] = ['SIGTERM', 'SIGINT', 'SIGHUP'];

/**
 * On the first signal: stop taking requests, let those in flight finish, close the database, exit 0. A second
 * signal, or a shutdown taking longer than 15 s, ends the process at once.
 */
function stopOnSignals(shutdown: () => Promise<void>, logger: AppLogger): void {
  let stopping = false;
  const onSignal = (signal: NodeJS.Signals) => {
    if (stopping) {
      logger.warn(`${signal} again: stopping at once.`, 'shutdown');
      process.exit(1);
    }
    stopping = true;
    logger.log(`${signal}: finishing requests in flight, then closing the database.`, 'shutdown');
    setTimeout(() => {
      logger.error('Shutdown took longer than 15 s; stopping at once.', undefined, 'shutdown');
      process.exit(1);
    }, 15_000).unref();
    shutdown().then(
      () => process.exit(0),
      (error: unknown) => {
        logger.error(`Shutdown failed: ${error instanceof Error ? error.message : String(error)}`, undefined, 'shutdown');
        process.exit(1);
      },
    );
  };
  for (const signal of SIGNALS) process.on(signal, onSignal);
}

main().catch((error: unknown) => {
  if (error instanceof ConfigError) {
    process.stderr.write(`${error.message}\n`);
  } else {
    process.stderr.write(`Tracebay could not start: ${error instanceof Error ? error.message : String(error)}\n`);
  }
  process.exit(1);
});
