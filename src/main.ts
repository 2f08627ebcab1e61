import 'reflect-metadata';
import { createApp } from './app/create-app';
import { AppLogger } from './common/logging/app-logger';
import { ConfigError, loadConfig } from './config/config';
import { openDatabase } from './database';
import { DEMO_USERS } from './demo/scenario';
import { seedDemo } from './demo/seed';

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
  if (config.demo && (await seedDemo(database.prisma)) === 'seeded') {
    logger.log('Seeded the invented demo shop "Kestrel Row Motor Works".', 'demo');
  }
  const app = await createApp(config, database, logger);
  await app.listen(config.port, config.host);
  const url = `http://${config.host === '0.0.0.0' ? '127.0.0.1' : config.host}:${config.port}`;
  const lines = [
    '',
    `Tracebay is running on the ${where}.`,
    `  Bay tablet:  ${url}/`,
    `  API:         ${url}/api`,
    `  API docs:    ${url}/api/docs`,
    `  Health:      ${url}/api/health`,
  ];
  if (config.demo) {
    lines.push('  Demo shop "Kestrel Row Motor Works"; its people (pick one on the tablet, or send the id as the X-Tracebay-User header):');
    for (const u of DEMO_USERS) lines.push(`    ${u.role.padEnd(10)} ${u.name.padEnd(16)} ${u.id}`);
  }
  lines.push('Stop with Ctrl+C.', '');
  process.stdout.write(lines.join('\n') + '\n');
}

main().catch((error: unknown) => {
  if (error instanceof ConfigError) {
    process.stderr.write(`${error.message}\n`);
  } else {
    process.stderr.write(`Tracebay could not start: ${error instanceof Error ? error.message : String(error)}\n`);
  }
  process.exit(1);
});
