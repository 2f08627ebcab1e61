// Migration drift: a database built only by prisma/migrations must match prisma/schema.prisma in
// every model, column type (native types included), nullability, default, enum, index and foreign
// key. Checked on the PostgreSQL server and on the embedded PostgreSQL (which accepts more SQL).
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { describeEachBackend } from '../support/db';
import { catalogShape, type CatalogQuery } from './drift/catalog-shape';
import { compareShapes } from './drift/compare-shapes';
import { expectedShape } from './drift/schema-shape';

const SCHEMA_PATH = join(__dirname, '..', '..', 'prisma', 'schema.prisma');

describeEachBackend('the migrations build exactly prisma/schema.prisma', (db) => {
  const query: CatalogQuery = (sql) => db().prisma.$queryRawUnsafe(sql);

  it('leaves no migration pending in the database they built', async () => {
    const state = await db().migrationState();
    expect(state.pending).toEqual([]);
    expect(state.applied.length).toBeGreaterThan(0);
  });

  it('shows no difference between the schema and the catalog', async () => {
    const findings = compareShapes(expectedShape(readFileSync(SCHEMA_PATH, 'utf8')), await catalogShape(query));
    expect(findings.map((f) => `${f.code} ${f.message}`)).toEqual([]);
  });

  it('reads the catalog it compares: every schema model appears as a table with columns', async () => {
    // Guards the comparison against an empty catalog read (which would only report missing tables).
    const actual = await catalogShape(query);
    const expected = expectedShape(readFileSync(SCHEMA_PATH, 'utf8'));
    const present = Object.keys(expected.tables).filter((t) => Object.keys(actual.tables[t]?.columns ?? {}).length > 0);
    expect(present.length).toBeGreaterThan(0);
  });
});

describe('the drift reader', () => {
  it('parses the project schema with Prisma’s parser into at least one table and enum', () => {
    const shape = expectedShape(readFileSync(SCHEMA_PATH, 'utf8'));
    expect(Object.keys(shape.tables).length).toBeGreaterThan(0);
  });
});
