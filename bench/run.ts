/**
 * `npm run bench`: runs every `bench/*.bench.ts` (or the ones named on the command line) and prints one
 * Markdown table per benchmark, ready to paste into the README. Benchmarks are never part of the test suite.
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';

export interface BenchResult {
  title: string;
  /** Column order is taken from the first row. */
  rows: Array<Record<string, string | number>>;
  notes?: string[];
}

function table(result: BenchResult): string {
  const columns = Object.keys(result.rows[0] ?? {});
  const line = (cells: Array<string | number>) => `| ${cells.join(' | ')} |`;
  return [
    `### ${result.title}`,
    '',
    line(columns),
    line(columns.map(() => '---')),
    ...result.rows.map((row) => line(columns.map((c) => row[c] ?? ''))),
    ...(result.notes?.length ? ['', ...result.notes] : []),
  ].join('\n');
}

async function main(): Promise<void> {
  const only = process.argv.slice(2);
  const files = readdirSync(__dirname)
    .filter((f) => f.endsWith('.bench.ts'))
    .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
    .sort();
  console.log(`Node ${process.version}, ${require('node:os').cpus().length} cores, ${new Date().toISOString()}\n`);
  for (const file of files) {
    const mod = (await import(join(__dirname, file))) as { default: () => Promise<BenchResult | BenchResult[]> };
    const results = await mod.default();
    for (const result of Array.isArray(results) ? results : [results]) console.log(`${table(result)}\n`);
  }
}

void main().catch((error: unknown) => {
  console.error(error);
  process.exitCode = 1;
});
