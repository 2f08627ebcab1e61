// `npm run db:migrate`: applies pending migrations to DATABASE_URL, or to the embedded database
// in TRACEBAY_DATA_DIR when no URL is set, and says what it did.
import { ConfigError, loadConfig } from '../config/config';
import { DatabaseError, openDatabase } from '../database';

async function main(): Promise<number> {
  const config = loadConfig(process.env);
  const where = config.databaseUrl ? 'PostgreSQL server' : `embedded database in ${config.dataDir}`;
  process.stdout.write(`Migrating the ${where} from ${config.migrationsDir}\n`);
  const database = await openDatabase({
    databaseUrl: config.databaseUrl,
    dataDir: config.dataDir,
    migrationsDir: config.migrationsDir,
    applyMigrations: true,
    logger: {
      log: (message) => process.stdout.write(`  ${message}\n`),
      warn: (message) => process.stderr.write(`  warning: ${message}\n`),
    },
  });
  try {
    const report = database.migrationReport;
    const applied = report?.applied ?? [];
    const before = report?.alreadyApplied.length ?? 0;
    process.stdout.write(
      applied.length > 0
        ? `Applied ${applied.length} migration(s): ${applied.join(', ')}; ${before} were already applied.\n`
        : `Nothing to apply: all ${before} migration(s) were already applied.\n`,
    );
  } finally {
    await database.close();
  }
  return 0;
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    if (error instanceof DatabaseError) {
      process.stderr.write(`Migration stopped [${error.code}]: ${error.message}\n`);
    } else if (error instanceof ConfigError) {
      process.stderr.write(`${error.message}\n`);
    } else {
      process.stderr.write(`Migration stopped: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
    }
    process.exit(1);
  },
);
