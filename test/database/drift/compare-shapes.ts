// Compares the schema's expected shape with the catalog's and names every difference as a
// coded, path-addressed finding. An empty list means the migrations build what the schema says.
import { isDeepStrictEqual } from 'node:util';
import type { ColumnShape, DefaultShape, ForeignKeyShape, IndexShape, SchemaShape } from './schema-shape';

export type DriftCode =
  | 'TABLE_MISSING' | 'TABLE_UNEXPECTED'
  | 'COLUMN_MISSING' | 'COLUMN_UNEXPECTED' | 'COLUMN_TYPE' | 'COLUMN_NULLABILITY' | 'COLUMN_DEFAULT'
  | 'ENUM_MISSING' | 'ENUM_UNEXPECTED' | 'ENUM_VALUES'
  | 'INDEX_MISSING' | 'INDEX_UNEXPECTED' | 'INDEX_DIFFERS'
  | 'FOREIGN_KEY_MISSING' | 'FOREIGN_KEY_UNEXPECTED' | 'FOREIGN_KEY_DIFFERS';

export interface DriftFinding {
  code: DriftCode;
  path: string;
  message: string;
}

export function compareShapes(expected: SchemaShape, actual: SchemaShape): DriftFinding[] {
  const findings: DriftFinding[] = [];
  const add = (code: DriftCode, path: string, message: string) => findings.push({ code, path, message });

  eachKey(expected.enums, actual.enums, {
    missing: (name) => add('ENUM_MISSING', `enums.${name}`, `enum ${name} is in the schema but not in the database`),
    unexpected: (name) => add('ENUM_UNEXPECTED', `enums.${name}`, `enum ${name} is in the database but not in the schema`),
    both: (name, want, got) => {
      const [a, b] = [[...want].sort(), [...got].sort()];
      if (!isDeepStrictEqual(a, b)) {
        add('ENUM_VALUES', `enums.${name}`, `enum ${name}: schema has [${want.join(', ')}], database has [${got.join(', ')}]`);
      }
    },
  });

  eachKey(expected.tables, actual.tables, {
    missing: (t) => add('TABLE_MISSING', `tables.${t}`, `table ${t} is in the schema but not in the database`),
    unexpected: (t) => add('TABLE_UNEXPECTED', `tables.${t}`, `table ${t} is in the database but not in the schema`),
    both: (t, want, got) => {
      eachKey(want.columns, got.columns, {
        missing: (c) => add('COLUMN_MISSING', `tables.${t}.columns.${c}`, `column ${t}.${c} is missing from the database`),
        unexpected: (c) => add('COLUMN_UNEXPECTED', `tables.${t}.columns.${c}`, `column ${t}.${c} is in the database but not in the schema`),
        both: (c, w, g) => compareColumn(`tables.${t}.columns.${c}`, `${t}.${c}`, w, g, add),
      });
      eachKey(want.indexes, got.indexes, {
        missing: (i) => add('INDEX_MISSING', `tables.${t}.indexes.${i}`, `index ${i} on ${t} (${describeIndex(want.indexes[i]!)}) is missing from the database`),
        unexpected: (i) => add('INDEX_UNEXPECTED', `tables.${t}.indexes.${i}`, `index ${i} on ${t} (${describeIndex(got.indexes[i]!)}) is not in the schema`),
        both: (i, w, g) => {
          if (!isDeepStrictEqual(w, g)) {
            add('INDEX_DIFFERS', `tables.${t}.indexes.${i}`, `index ${i}: schema says ${describeIndex(w)}, database has ${describeIndex(g)}`);
          }
        },
      });
      eachKey(want.foreignKeys, got.foreignKeys, {
        missing: (k) => add('FOREIGN_KEY_MISSING', `tables.${t}.foreignKeys.${k}`, `foreign key ${k} (${describeKey(want.foreignKeys[k]!)}) is missing from the database`),
        unexpected: (k) => add('FOREIGN_KEY_UNEXPECTED', `tables.${t}.foreignKeys.${k}`, `foreign key ${k} (${describeKey(got.foreignKeys[k]!)}) is not in the schema`),
        both: (k, w, g) => {
          if (!isDeepStrictEqual(w, g)) {
            add('FOREIGN_KEY_DIFFERS', `tables.${t}.foreignKeys.${k}`, `foreign key ${k}: schema says ${describeKey(w)}, database has ${describeKey(g)}`);
          }
        },
      });
    },
  });
  return findings;
}

function compareColumn(
  path: string,
  label: string,
  want: ColumnShape,
  got: ColumnShape,
  add: (code: DriftCode, path: string, message: string) => void,
): void {
  if (want.type !== got.type) add('COLUMN_TYPE', `${path}.type`, `column ${label}: schema says ${want.type}, database has ${got.type}`);
  if (want.nullable !== null && got.nullable !== null && want.nullable !== got.nullable) {
    add('COLUMN_NULLABILITY', `${path}.nullable`, `column ${label}: schema says ${want.nullable ? 'NULL' : 'NOT NULL'}, database has ${got.nullable ? 'NULL' : 'NOT NULL'}`);
  }
  if (!defaultsAgree(want.default, got.default)) {
    add('COLUMN_DEFAULT', `${path}.default`, `column ${label}: schema default ${describeDefault(want.default)}, database default ${describeDefault(got.default)}`);
  }
}

export function defaultsAgree(want: DefaultShape, got: DefaultShape): boolean {
  if (want.kind === 'expression') return got.kind !== 'none';
  if (want.kind !== 'value') return want.kind === got.kind;
  if (got.kind !== 'value') return false;
  return valuesAgree(want.value, got.value, want.json === true);
}

function valuesAgree(want: unknown, got: unknown, json: boolean): boolean {
  if (json) {
    try {
      return isDeepStrictEqual(JSON.parse(String(want)), JSON.parse(String(got)));
    } catch {
      return false;
    }
  }
  if (Array.isArray(want)) {
    return Array.isArray(got) && want.length === got.length && want.every((w, i) => valuesAgree(w, got[i], false));
  }
  if (typeof want === 'number') return Number(got) === want;
  if (typeof want === 'boolean') return got === want || String(got) === String(want);
  return String(got) === String(want);
}

function eachKey<T>(
  want: Record<string, T>,
  got: Record<string, T>,
  on: { missing(key: string): void; unexpected(key: string): void; both(key: string, want: T, got: T): void },
): void {
  for (const key of Object.keys(want).sort()) {
    if (key in got) on.both(key, want[key]!, got[key]!);
    else on.missing(key);
  }
  for (const key of Object.keys(got).sort()) if (!(key in want)) on.unexpected(key);
}

function describeIndex(i: IndexShape): string {
  const kind = i.primary ? 'primary key' : i.unique ? 'unique' : 'non-unique';
  return `${kind} ${i.method} on (${i.columns.join(', ')})`;
}

function describeKey(k: ForeignKeyShape): string {
  return `(${k.columns.join(', ')}) -> ${k.refTable}(${k.refColumns.join(', ')}) ON DELETE ${k.onDelete} ON UPDATE ${k.onUpdate}`;
}

function describeDefault(d: DefaultShape): string {
  return d.kind === 'value' ? `value ${JSON.stringify(d.value)}` : d.kind;
}
