#!/usr/bin/env node
// Stands in for Prisma's native schema engine, which cannot be downloaded on offline machines.
// `prisma generate` never runs it; the CLI only asks its version. Anything else must fail loudly
// (a stub that "succeeds" would make `prisma migrate deploy` report success and apply nothing).
if (process.argv.includes('--version')) {
  console.log('schema-engine-cli offline-stub');
  process.exit(0);
}
console.error('The Prisma schema engine is not available offline; Tracebay applies migrations itself (npm run db:migrate).');
process.exit(1);
