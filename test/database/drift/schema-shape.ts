// What the database must look like according to prisma/schema.prisma, read with Prisma's own
// parser (@prisma/prisma-schema-wasm get_dmmf, pinned to the engines of the installed CLI) and
// rendered the way Prisma's migrations render it on PostgreSQL.
import { get_dmmf } from '@prisma/prisma-schema-wasm';

export type DefaultShape =
  | { kind: 'none' }
  | { kind: 'autoincrement' }
  | { kind: 'now' }
  /** dbgenerated(...), or an expression the reader did not parse: only its presence is compared. */
  | { kind: 'expression' }
  | { kind: 'value'; value: unknown; json?: boolean };

export interface ColumnShape {
  /** format_type() spelling, e.g. `timestamp(3) with time zone`, `character varying(17)`, `text[]`; enums as `enum:Name`. */
  type: string;
  /** null for lists: Prisma ignores NOT NULL on array columns. */
  nullable: boolean | null;
  default: DefaultShape;
}

export interface IndexShape {
  primary: boolean;
  unique: boolean;
  /** Column names in order, ` DESC` appended to descending ones. */
  columns: string[];
  method: string;
}

export interface ForeignKeyShape {
  columns: string[];
  refTable: string;
  refColumns: string[];
  onDelete: string;
  onUpdate: string;
}

export interface TableShape {
  columns: Record<string, ColumnShape>;
  indexes: Record<string, IndexShape>;
  foreignKeys: Record<string, ForeignKeyShape>;
}

export interface SchemaShape {
  tables: Record<string, TableShape>;
  enums: Record<string, string[]>;
}

// Minimal typings of the DMMF parts used here.
export interface DmmfField {
  name: string;
  dbName?: string | null;
  kind: 'scalar' | 'enum' | 'object' | 'unsupported';
  type: string;
  isList: boolean;
  isRequired: boolean;
  hasDefaultValue: boolean;
  default?: unknown;
  nativeType?: [string, string[]] | null;
  relationName?: string;
  relationFromFields?: string[];
  relationToFields?: string[];
  relationOnDelete?: string;
  relationOnUpdate?: string;
}
export interface DmmfModel { name: string; dbName: string | null; fields: DmmfField[] }
export interface DmmfIndex {
  model: string;
  type: 'id' | 'unique' | 'normal' | 'fulltext';
  dbName?: string | null;
  algorithm?: string;
  fields: { name: string; sortOrder?: 'asc' | 'desc' }[];
}
export interface Datamodel {
  enums: { name: string; dbName: string | null; values: { name: string; dbName: string | null }[] }[];
  models: DmmfModel[];
  indexes: DmmfIndex[];
}

export function readDatamodel(schemaText: string): Datamodel {
  return (JSON.parse(get_dmmf(JSON.stringify({ prismaSchema: schemaText }))) as { datamodel: Datamodel }).datamodel;
}

const SCALAR_TYPES: Record<string, string> = {
  String: 'text', Boolean: 'boolean', Int: 'integer', BigInt: 'bigint', Float: 'double precision',
  Decimal: 'numeric(65,30)', DateTime: 'timestamp(3) without time zone', Json: 'jsonb', Bytes: 'bytea',
};

/** Prisma's PostgreSQL native types, spelt as format_type() prints them; `$n` is the n-th argument. */
const NATIVE_TYPES: Record<string, { bare: string; withArgs?: string }> = {
  Text: { bare: 'text' }, Uuid: { bare: 'uuid' }, Xml: { bare: 'xml' }, Inet: { bare: 'inet' }, Citext: { bare: 'citext' },
  VarChar: { bare: 'character varying', withArgs: 'character varying($1)' },
  Char: { bare: 'character(1)', withArgs: 'character($1)' },
  Bit: { bare: 'bit(1)', withArgs: 'bit($1)' }, VarBit: { bare: 'bit varying', withArgs: 'bit varying($1)' },
  Integer: { bare: 'integer' }, SmallInt: { bare: 'smallint' }, Oid: { bare: 'oid' }, BigInt: { bare: 'bigint' },
  DoublePrecision: { bare: 'double precision' }, Real: { bare: 'real' }, Money: { bare: 'money' },
  Decimal: { bare: 'numeric', withArgs: 'numeric($1,$2)' },
  Timestamp: { bare: 'timestamp without time zone', withArgs: 'timestamp($1) without time zone' },
  Timestamptz: { bare: 'timestamp with time zone', withArgs: 'timestamp($1) with time zone' },
  Time: { bare: 'time without time zone', withArgs: 'time($1) without time zone' },
  Timetz: { bare: 'time with time zone', withArgs: 'time($1) with time zone' },
  Date: { bare: 'date' }, Json: { bare: 'json' }, JsonB: { bare: 'jsonb' }, ByteA: { bare: 'bytea' }, Boolean: { bare: 'boolean' },
};

const ACTIONS: Record<string, string> = {
  Cascade: 'CASCADE', Restrict: 'RESTRICT', NoAction: 'NO ACTION', SetNull: 'SET NULL', SetDefault: 'SET DEFAULT',
};

/** Prisma's default constraint names on PostgreSQL (psl ConstraintNames, identifier limit 63). */
export function defaultConstraintName(table: string, columns: string[], suffix: 'pkey' | 'key' | 'idx' | 'fkey'): string {
  const limit = 63;
  if (suffix === 'pkey') return `${table.length >= limit - 5 ? table.slice(0, limit - 5) : table}_pkey`;
  const joined = `${table}_${columns.join('_')}`;
  const room = limit - suffix.length - 1;
  return `${joined.length >= room ? joined.slice(0, room) : joined}_${suffix}`;
}

export function expectedShape(schemaText: string): SchemaShape {
  return shapeFromDatamodel(readDatamodel(schemaText), schemaText);
}

export function shapeFromDatamodel(dm: Datamodel, schemaText = ''): SchemaShape {
  const enumDbName = new Map(dm.enums.map((e) => [e.name, e.dbName ?? e.name]));
  const enumValueDbName = new Map(dm.enums.map((e) => [e.name, new Map(e.values.map((v) => [v.name, v.dbName ?? v.name]))]));
  const models = new Map(dm.models.map((m) => [m.name, m]));
  const tableOf = (m: DmmfModel): string => m.dbName ?? m.name;
  const columnOf = (m: DmmfModel, field: string): string => {
    const f = m.fields.find((x) => x.name === field);
    return f?.dbName ?? field;
  };
  const shape: SchemaShape = { tables: {}, enums: {} };
  for (const e of dm.enums) shape.enums[e.dbName ?? e.name] = e.values.map((v) => v.dbName ?? v.name);

  for (const model of dm.models) {
    const table: TableShape = { columns: {}, indexes: {}, foreignKeys: {} };
    shape.tables[tableOf(model)] = table;
    for (const f of model.fields) {
      if (f.kind !== 'scalar' && f.kind !== 'enum') continue;
      const base = f.kind === 'enum' ? `enum:${enumDbName.get(f.type)}` : scalarType(f);
      table.columns[f.dbName ?? f.name] = {
        type: f.isList ? `${base}[]` : base,
        nullable: f.isList ? null : !f.isRequired,
        default: expectedDefault(f, enumValueDbName.get(f.type)),
      };
    }
    for (const f of model.fields) {
      if (f.kind !== 'object' || !f.relationFromFields?.length) continue;
      const target = models.get(f.type)!;
      const columns = f.relationFromFields.map((n) => columnOf(model, n));
      const optional = f.relationFromFields.some((n) => !model.fields.find((x) => x.name === n)?.isRequired);
      const name = mappedForeignKeyName(schemaText, model.name, f.name) ?? defaultConstraintName(tableOf(model), columns, 'fkey');
      table.foreignKeys[name] = {
        columns,
        refTable: tableOf(target),
        refColumns: (f.relationToFields ?? []).map((n) => columnOf(target, n)),
        onDelete: ACTIONS[f.relationOnDelete ?? (optional ? 'SetNull' : 'Restrict')]!,
        onUpdate: ACTIONS[f.relationOnUpdate ?? 'Cascade']!,
      };
    }
  }
  for (const index of dm.indexes) {
    const model = models.get(index.model)!;
    const table = tableOf(model);
    const columns = index.fields.map((f) => columnOf(model, f.name));
    const suffix = index.type === 'id' ? 'pkey' : index.type === 'unique' ? 'key' : 'idx';
    shape.tables[table]!.indexes[index.dbName ?? defaultConstraintName(table, columns, suffix)] = {
      primary: index.type === 'id',
      unique: index.type === 'id' || index.type === 'unique',
      columns: index.fields.map((f, i) => columns[i] + (f.sortOrder === 'desc' ? ' DESC' : '')),
      method: (index.algorithm ?? 'BTree').toLowerCase(),
    };
  }
  addImplicitManyToMany(dm, shape, tableOf);
  return shape;
}

function scalarType(f: DmmfField): string {
  if (!f.nativeType) {
    const type = SCALAR_TYPES[f.type];
    if (!type) throw new Error(`Field ${f.name}: no PostgreSQL type known for Prisma type ${f.type}`);
    return type;
  }
  const [name, args] = f.nativeType;
  const native = NATIVE_TYPES[name];
  if (!native) throw new Error(`Field ${f.name}: no PostgreSQL spelling known for @db.${name}`);
  if (args.length === 0 || !native.withArgs) return native.bare;
  return native.withArgs.replace(/\$(\d)/g, (_, i: string) => args[Number(i) - 1]!.trim());
}

function expectedDefault(f: DmmfField, enumValues: Map<string, string> | undefined): DefaultShape {
  if (!f.hasDefaultValue || f.default === undefined) return { kind: 'none' };
  const d = f.default;
  if (d !== null && typeof d === 'object' && !Array.isArray(d) && 'name' in d) {
    const name = (d as { name: string }).name;
    if (name === 'autoincrement' || name === 'sequence') return { kind: 'autoincrement' };
    if (name === 'now') return { kind: 'now' };
    if (name === 'dbgenerated') return { kind: 'expression' };
    return { kind: 'none' }; // uuid(), cuid(), nanoid(), ulid(): generated by the client, no column default
  }
  if (f.kind === 'enum') {
    const map = (v: unknown): unknown => enumValues?.get(String(v)) ?? v;
    return { kind: 'value', value: Array.isArray(d) ? d.map(map) : map(d) };
  }
  return { kind: 'value', value: d, json: f.type === 'Json' };
}

/** get_dmmf omits `map:` of @relation; read it from the field's own line. */
function mappedForeignKeyName(schemaText: string, model: string, field: string): string | undefined {
  const block = new RegExp(`^model\\s+${model}\\s*\\{([\\s\\S]*?)^\\}`, 'm').exec(schemaText)?.[1] ?? '';
  const line = block.split('\n').find((l) => new RegExp(`^\\s*${field}\\s`).test(l)) ?? '';
  return /@relation\([^)]*\bmap:\s*"([^"]+)"/.exec(line)?.[1];
}

/** Implicit many-to-many: Prisma's `_Relation` join table with columns A and B (A = first model by name). */
function addImplicitManyToMany(dm: Datamodel, shape: SchemaShape, tableOf: (m: DmmfModel) => string): void {
  const seen = new Set<string>();
  for (const model of dm.models) {
    for (const f of model.fields) {
      if (f.kind !== 'object' || !f.isList || !f.relationName || seen.has(f.relationName)) continue;
      const other = dm.models.find((m) => m.name === f.type)!;
      const back = other.fields.find((x) => x.relationName === f.relationName && x !== f);
      if (!back?.isList || f.relationFromFields?.length || back.relationFromFields?.length) continue;
      seen.add(f.relationName);
      const [a, b] = [model, other].sort((x, y) => x.name.localeCompare(y.name)) as [DmmfModel, DmmfModel];
      const table = `_${f.relationName}`;
      const idOf = (m: DmmfModel): DmmfField => m.fields.find((x) => dm.indexes.some((i) => i.model === m.name && i.type === 'id' && i.fields[0]?.name === x.name))!;
      const [idA, idB] = [idOf(a), idOf(b)];
      shape.tables[table] = {
        columns: {
          A: { type: scalarType(idA), nullable: false, default: { kind: 'none' } },
          B: { type: scalarType(idB), nullable: false, default: { kind: 'none' } },
        },
        indexes: {
          [`${table}_AB_pkey`]: { primary: true, unique: true, columns: ['A', 'B'], method: 'btree' },
          [`${table}_B_index`]: { primary: false, unique: false, columns: ['B'], method: 'btree' },
        },
        foreignKeys: {
          [`${table}_A_fkey`]: { columns: ['A'], refTable: tableOf(a), refColumns: [idA.dbName ?? idA.name], onDelete: 'CASCADE', onUpdate: 'CASCADE' },
          [`${table}_B_fkey`]: { columns: ['B'], refTable: tableOf(b), refColumns: [idB.dbName ?? idB.name], onDelete: 'CASCADE', onUpdate: 'CASCADE' },
        },
      };
    }
  }
}
