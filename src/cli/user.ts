// `npm run user -- create-admin --shop "Name" --email x --name y`: creates the first admin (and their shop) on a
// new install. The password comes from stdin (piped) or is asked for twice at the terminal, never from the
// command line (it would stay in the shell history and the process list).
import { textProblem } from '../engine/text';
import { createInterface } from 'node:readline';
import { ConfigError, loadConfig } from '../config/config';
import { DatabaseError, openDatabase } from '../database';
import { checkPassword } from '../modules/auth/password-rules';
import { hashPassword } from '../modules/auth/secrets';

const USAGE = 'usage: npm run user -- create-admin --shop "Shop name" --email person@example.org --name "Full Name" [--address "Street"]';

class UsageError extends Error {}

function parseArgs(argv: string[]): { command: string; options: Record<string, string> } {
  const [command, ...rest] = argv;
  if (command !== 'create-admin') throw new UsageError(`unknown command ${command ?? '(none)'}`);
  const options: Record<string, string> = {};
  for (let i = 0; i < rest.length; i += 2) {
    const key = rest[i]!;
    const value = rest[i + 1];
    if (!/^--(shop|email|name|address)$/.test(key)) throw new UsageError(`unknown option ${key}`);
    if (value === undefined || value.startsWith('--')) throw new UsageError(`${key} needs a value`);
    options[key.slice(2)] = value.trim();
  }
  for (const required of ['shop', 'email', 'name']) if (!options[required]) throw new UsageError(`--${required} is required`);
  for (const key of ['shop', 'name'] as const) {
    options[key] = options[key]!.normalize('NFC');
    const problem = textProblem(options[key]!, 'name');
    if (problem) throw new UsageError(`--${key}: ${problem}`);
  }
  if (!/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(options.email!)) throw new UsageError(`--email: expected an email address, got "${options.email}"`);
  options.email = options.email!.toLowerCase();
  return { command, options };
}

/** Reads the password: all of stdin when piped, otherwise asked twice at the terminal without echo. */
async function readPassword(): Promise<string> {
  if (!process.stdin.isTTY) {
    const chunks: Buffer[] = [];
    for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
    return Buffer.concat(chunks).toString('utf8').replace(/\r?\n$/, '');
  }
  const ask = (prompt: string) =>
    new Promise<string>((resolve) => {
      const rl = createInterface({ input: process.stdin, output: process.stdout, terminal: true });
      const write = (rl as unknown as { _writeToOutput: (s: string) => void })._writeToOutput;
      (rl as unknown as { _writeToOutput: (s: string) => void })._writeToOutput = (s: string) => write.call(rl, s.startsWith(prompt) ? prompt : '');
      rl.question(prompt, (answer) => {
        rl.close();
        process.stdout.write('\n');
        resolve(answer);
      });
    });
  const first = await ask('Password for the new admin: ');
  const second = await ask('The same password again: ');
  if (first !== second) throw new UsageError('the two passwords differ');
  return first;
}

async function main(): Promise<number> {
  const { options } = parseArgs(process.argv.slice(2));
  const config = loadConfig(process.env);
  const password = await readPassword();
  const findings = checkPassword(password, { email: options.email, name: options.name, shopName: options.shop });
  if (findings.length > 0) {
    process.stderr.write(`Password refused:\n${findings.map((f) => `  - [${f.code}] ${f.message}`).join('\n')}\n`);
    return 2;
  }
  const passwordHash = await hashPassword(password);
  const database = await openDatabase({
    databaseUrl: config.databaseUrl,
    dataDir: config.dataDir,
    migrationsDir: config.migrationsDir,
    applyMigrations: true,
    logger: { log: () => undefined, warn: (m) => process.stderr.write(`  warning: ${m}\n`) },
  });
  try {
    const prisma = database.prisma;
    if (await prisma.user.findUnique({ where: { email: options.email }, select: { id: true } })) {
      process.stderr.write(`An account with the email ${options.email} already exists.\n`);
      return 1;
    }
    const { shop, user } = await prisma.$transaction(async (tx) => {
      const shop = (await tx.shop.findFirst({ where: { name: options.shop } })) ?? (await tx.shop.create({ data: { name: options.shop!, address: options.address ?? '' } }));
      const user = await tx.user.create({ data: { shopId: shop.id, name: options.name!, email: options.email!, role: 'admin', passwordHash } });
      return { shop, user };
    });
    process.stdout.write(`Created admin ${user.name} <${user.email}> (id ${user.id}) for the shop "${shop.name}" (id ${shop.id}). Sign in at /sign-in.\n`);
    return 0;
  } finally {
    await database.close();
  }
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    if (error instanceof UsageError) process.stderr.write(`${error.message}\n${USAGE}\n`);
    else if (error instanceof ConfigError) process.stderr.write(`${error.message}\n`);
    else if (error instanceof DatabaseError) process.stderr.write(`Database [${error.code}]: ${error.message}\n`);
    else process.stderr.write(`user: ${error instanceof Error ? error.message : String(error)}\n`);
    process.exit(error instanceof UsageError ? 64 : 1);
  },
);
