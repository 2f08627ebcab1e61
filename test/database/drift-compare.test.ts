// The drift comparison must fail when schema and database disagree. Proven two ways: a small
// schema with its hand-written Prisma-style migration, altered one attribute at a time and
// compared with the real catalog on both back ends; and the project schema's own shape, mutated.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Database } from '../../src/database';
import { BACKENDS, scratchDatabase, type ScratchDatabase } from '../support/db';
import { catalogShape, parseDefault } from './drift/catalog-shape';
import { compareShapes, type DriftCode } from './drift/compare-shapes';
import { expectedShape, type SchemaShape } from './drift/schema-shape';
import { MigrationsFolder } from './migrations-folder';

const BAY_SCHEMA = `
datasource db {
  provider = "postgresql"
}

enum BayState {
  open
  closed
}

model Bay {
  id     String   @id @default(uuid()) @db.Uuid
  code   String   @unique @db.VarChar(8)
  state  BayState @default(open)
  opened DateTime @default(now()) @db.Timestamptz(3)
  note   String?
  lifts  Int      @default(2)
  tags   String[] @default([])
  jobs   Job[]
}

model Job {
  id    Int    @id @default(autoincrement())
  bayId String @db.Uuid
  title String
  amps  Float?
  bay   Bay    @relation(fields: [bayId], references: [id], onDelete: Cascade)

  @@unique([bayId, title])
  @@index([title(sort: Desc)])
}
`;

/** Written by hand in the SQL that Prisma's migrate emits for BAY_SCHEMA. */
const BAY_MIGRATION = `
CREATE TYPE "BayState" AS ENUM ('open', 'closed');
CREATE TABLE "Bay" (
    "id" UUID NOT NULL,
    "code" VARCHAR(8) NOT NULL,
    "state" "BayState" NOT NULL DEFAULT 'open',
    "opened" TIMESTAMPTZ(3) NOT NULL DEFAULT CURRENT_TIMESTAMP,
    "note" TEXT,
    "lifts" INTEGER NOT NULL DEFAULT 2,
    "tags" TEXT[] DEFAULT ARRAY[]::TEXT[],
    CONSTRAINT "Bay_pkey" PRIMARY KEY ("id")
);
CREATE TABLE "Job" (
    "id" SERIAL NOT NULL,
    "bayId" UUID NOT NULL,
    "title" TEXT NOT NULL,
    "amps" DOUBLE PRECISION,
    CONSTRAINT "Job_pkey" PRIMARY KEY ("id")
);
CREATE UNIQUE INDEX "Bay_code_key" ON "Bay"("code");
CREATE UNIQUE INDEX "Job_bayId_title_key" ON "Job"("bayId", "title");
CREATE INDEX "Job_title_idx" ON "Job"("title" DESC);
ALTER TABLE "Job" ADD CONSTRAINT "Job_bayId_fkey" FOREIGN KEY ("bayId") REFERENCES "Bay"("id") ON DELETE CASCADE ON UPDATE CASCADE;
`;

const ALTERATIONS: { change: string; from: string; to: string; code: DriftCode; path: string }[] = [
  { change: 'a timestamp precision', from: '@db.Timestamptz(3)', to: '@db.Timestamptz(6)', code: 'COLUMN_TYPE', path: 'tables.Bay.columns.opened.type' },
  { change: 'a varchar length', from: '@db.VarChar(8)', to: '@db.VarChar(12)', code: 'COLUMN_TYPE', path: 'tables.Bay.columns.code.type' },
  { change: 'a scalar type', from: 'amps  Float?', to: 'amps  Decimal?', code: 'COLUMN_TYPE', path: 'tables.Job.columns.amps.type' },
  { change: 'nullability', from: 'note   String?', to: 'note   String', code: 'COLUMN_NULLABILITY', path: 'tables.Bay.columns.note.nullable' },
  { change: 'a default value', from: '@default(2)', to: '@default(3)', code: 'COLUMN_DEFAULT', path: 'tables.Bay.columns.lifts.default' },
  { change: 'a removed default', from: 'Int      @default(2)', to: 'Int', code: 'COLUMN_DEFAULT', path: 'tables.Bay.columns.lifts.default' },
  { change: 'an enum default', from: '@default(open)', to: '@default(closed)', code: 'COLUMN_DEFAULT', path: 'tables.Bay.columns.state.default' },
  { change: 'an enum value', from: '  closed\n}', to: '  closed\n  parked\n}', code: 'ENUM_VALUES', path: 'enums.BayState' },
  { change: 'a dropped unique constraint', from: 'String   @unique @db.VarChar(8)', to: 'String   @db.VarChar(8)', code: 'INDEX_UNEXPECTED', path: 'tables.Bay.indexes.Bay_code_key' },
  { change: 'an index sort order', from: '@@index([title(sort: Desc)])', to: '@@index([title])', code: 'INDEX_DIFFERS', path: 'tables.Job.indexes.Job_title_idx' },
  { change: 'a referential action', from: 'onDelete: Cascade', to: 'onDelete: Restrict', code: 'FOREIGN_KEY_DIFFERS', path: 'tables.Job.foreignKeys.Job_bayId_fkey' },
  { change: 'an added field', from: '  amps  Float?\n', to: '  amps  Float?\n  extra String?\n', code: 'COLUMN_MISSING', path: 'tables.Job.columns.extra' },
  { change: 'an added model', from: 'model Job {', to: 'model Lift {\n  id Int @id\n}\n\nmodel Job {', code: 'TABLE_MISSING', path: 'tables.Lift' },
];

describe.each(BACKENDS.map((b) => [b]))('the drift comparison against a real %s catalog', (backend) => {
  let scratch: ScratchDatabase;
  let db: Database;
  let folder: MigrationsFolder;
  let actual: SchemaShape;
  beforeAll(async () => {
    scratch = await scratchDatabase(backend, 'empty');
    folder = new MigrationsFolder({ '1_bays': BAY_MIGRATION });
    db = await scratch.open({ migrationsDir: folder.dir });
    actual = await catalogShape((sql) => db.prisma.$queryRawUnsafe(sql));
  });
  afterAll(async () => {
    await scratch?.drop();
    folder?.remove();
  });

  it('finds no difference between the schema and its faithful migration', () => {
    expect(compareShapes(expectedShape(BAY_SCHEMA), actual)).toEqual([]);
  });

  it.each(ALTERATIONS)('reports $code at $path after changing $change in the schema', ({ from, to, code, path }) => {
    expect(BAY_SCHEMA).toContain(from);
    const findings = compareShapes(expectedShape(BAY_SCHEMA.replace(from, to)), actual);
    expect(findings).toContainEqual(expect.objectContaining({ code, path }));
  });
});

describe('the drift comparison on the project schema’s own shape, deliberately altered', () => {
  const schema = readFileSync(join(__dirname, '..', '..', 'prisma', 'schema.prisma'), 'utf8');
  const first = <T>(record: Record<string, T>): [string, T] => Object.entries(record)[0]!;

  it.each<{ change: string; code: DriftCode; alter: (s: SchemaShape) => string }>([
    { change: 'a column type', code: 'COLUMN_TYPE', alter: (s) => { const [t, table] = first(s.tables); const [c, col] = first(table.columns); col.type = 'bytea'; return `tables.${t}.columns.${c}.type`; } },
    { change: 'a column nullability', code: 'COLUMN_NULLABILITY', alter: (s) => { const [t, table] = first(s.tables); const [c, col] = first(table.columns); col.nullable = !col.nullable; return `tables.${t}.columns.${c}.nullable`; } },
    { change: 'a column default', code: 'COLUMN_DEFAULT', alter: (s) => { const [t, table] = first(s.tables); const [c, col] = first(table.columns); col.default = { kind: 'now' }; return `tables.${t}.columns.${c}.default`; } },
    { change: 'an enum value', code: 'ENUM_VALUES', alter: (s) => { const [e, values] = first(s.enums); values.pop(); return `enums.${e}`; } },
    { change: 'an index column list', code: 'INDEX_DIFFERS', alter: (s) => { const [t, table] = first(s.tables); const [i, index] = first(table.indexes); index.columns.push('extra'); return `tables.${t}.indexes.${i}`; } },
    { change: 'a foreign key action', code: 'FOREIGN_KEY_DIFFERS', alter: (s) => { const [t, table] = Object.entries(s.tables).find(([, x]) => Object.keys(x.foreignKeys).length > 0)!; const [k, key] = first(table.foreignKeys); key.onDelete = 'SET DEFAULT'; return `tables.${t}.foreignKeys.${k}`; } },
  ])('reports $code when $change differs', ({ code, alter }) => {
    const original = expectedShape(schema);
    const altered = structuredClone(original);
    const path = alter(altered);
    expect(compareShapes(original, original)).toEqual([]);
    expect(compareShapes(altered, original)).toEqual([expect.objectContaining({ code, path })]);
  });
});

describe('reading column defaults from pg_get_expr', () => {
  it.each([
    [null, { kind: 'none' }],
    ["nextval('\"Job_id_seq\"'::regclass)", { kind: 'autoincrement' }],
    ['CURRENT_TIMESTAMP', { kind: 'now' }],
    ["'open'::\"BayState\"", { kind: 'value', value: 'open' }],
    ["'it''s'::text", { kind: 'value', value: "it's" }],
    ["'{}'::jsonb", { kind: 'value', value: '{}' }],
    ['ARRAY[]::text[]', { kind: 'value', value: [] }],
    ["ARRAY['P0122'::text, 'P0123'::text]", { kind: 'value', value: ['P0122', 'P0123'] }],
    ['10000000', { kind: 'value', value: 10000000 }],
    ["'2.5'::numeric", { kind: 'value', value: '2.5' }],
    ['true', { kind: 'value', value: true }],
    ['gen_random_uuid()', { kind: 'expression' }],
  ])('reads %s as %j', (expr, shape) => {
    expect(parseDefault(expr)).toEqual(shape);
  });
});
