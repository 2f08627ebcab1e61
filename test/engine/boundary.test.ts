import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = join(__dirname, '..', '..');
const ENGINE = join(ROOT, 'src', 'engine');

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? sources(path) : path.endsWith('.ts') ? [path] : [];
  });
}

function imports(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  return [...text.matchAll(/(?:from\s+|import\s*\(\s*|require\s*\(\s*)['"]([^'"]+)['"]/g)].map((m) => m[1]);
}

/** Framework code the engine must never reach, directly or through a relative path out of src/engine. */
const FORBIDDEN = [/^@nestjs\//, /^@prisma\//, /^pdfkit$/, /^express$/, /^pg$/, /^@electric-sql\//, /generated\/prisma/, /(^|\/)modules\//, /proof-render/];

describe('the engine stays framework-free', () => {
  const files = sources(ENGINE);

  it.each(files.map((f) => [relative(ROOT, f), f]))('%s imports no framework, database or PDF code', (_name, file) => {
    const bad = imports(file).filter((spec) => FORBIDDEN.some((rule) => rule.test(spec)));
    const escapes = imports(file)
      .filter((spec) => spec.startsWith('.'))
      .filter((spec) => !join(file, '..', spec).startsWith(ENGINE));
    expect([...bad, ...escapes]).toEqual([]);
  });

  it('keeps json-rules-engine behind a single adapter file', () => {
    const users = files.filter((f) => imports(f).includes('json-rules-engine')).map((f) => relative(ROOT, f));
    expect(users.length).toBeLessThanOrEqual(1);
  });
});
