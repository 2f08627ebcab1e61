// Runs `prisma generate` without letting the CLI download its schema engine (unreachable offline).
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const env = {
  ...process.env,
  PRISMA_SCHEMA_ENGINE_BINARY: process.env.PRISMA_SCHEMA_ENGINE_BINARY ?? join(root, 'scripts', 'prisma-engine-stub.mjs'),
  CHECKPOINT_DISABLE: '1',
  PRISMA_HIDE_UPDATE_MESSAGE: '1',
};
const cli = join(root, 'node_modules', 'prisma', 'build', 'index.js');
const result = spawnSync(process.execPath, [cli, 'generate', '--schema', join(root, 'prisma', 'schema.prisma')], {
  env,
  stdio: 'inherit',
  cwd: root,
});
process.exit(result.status ?? 1);
