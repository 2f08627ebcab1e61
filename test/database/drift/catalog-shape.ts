// What the database actually looks like, read from pg_catalog in the connection's schema and
// rendered in the same shape as schema-shape.ts. Every value is selected as text, boolean or
// JSON text so both Prisma adapters (pg and PGlite) return it unchanged.
import type { DefaultShape, SchemaShape } from './schema-shape';

export type CatalogQuery = (sql: string) => Promise<Record<string, unknown>[]>;

const COLUMNS = `
SELECT c.relname::text AS "table", a.attname::text AS "column",
       format_type(a.atttypid, a.atttypmod) AS "type",
       t.typtype::text AS "typtype", t.typname::text AS "typname",
       et.typtype::text AS "elemTyptype", et.typname::text AS "elemTypname",
       NOT a.attnotnull AS "nullable", a.attidentity::text AS "identity",
       pg_get_expr(d.adbin, d.adrelid) AS "defaultExpr"
FROM pg_attribute a
JOIN pg_class c ON c.oid = a.attrelid
JOIN pg_namespace n ON n.oid = c.relnamespace
JOIN pg_type t ON t.oid = a.atttypid
LEFT JOIN pg_type et ON et.oid = t.typelem AND t.typcategory = 'A'
LEFT JOIN pg_attrdef d ON d.adrelid = a.attrelid AND d.adnum = a.attnum
WHERE n.nspname = current_schema() AND c.relkind IN ('r', 'p') AND a.attnum > 0 AND NOT a.attisdropped
  AND c.relname <> '_prisma_migrations'
ORDER BY c.relname, a.attnum`;

const INDEXES = `
SELECT ic.relname::text AS "name", tc.relname::text AS "table", ix.indisunique AS "unique",
       ix.indisprimary AS "primary", am.amname::text AS "method",
       (SELECT json_agg(COALESCE(a.attname::text, pg_get_indexdef(ix.indexrelid, k.ord::int, true))
                || CASE WHEN ((ix.indoption::int2[])[array_lower(ix.indoption::int2[], 1) + k.ord::int - 1] & 1) = 1
                        THEN ' DESC' ELSE '' END ORDER BY k.ord)::text
          FROM unnest(ix.indkey::int2[]) WITH ORDINALITY AS k(attnum, ord)
          LEFT JOIN pg_attribute a ON a.attrelid = ix.indrelid AND a.attnum = k.attnum AND k.attnum > 0
         WHERE k.ord <= ix.indnkeyatts) AS "columns"
FROM pg_index ix
JOIN pg_class ic ON ic.oid = ix.indexrelid
JOIN pg_class tc ON tc.oid = ix.indrelid
JOIN pg_namespace n ON n.oid = tc.relnamespace
JOIN pg_am am ON am.oid = ic.relam
WHERE n.nspname = current_schema() AND tc.relname <> '_prisma_migrations'`;

const FOREIGN_KEYS = `
SELECT con.conname::text AS "name", tc.relname::text AS "table", rc.relname::text AS "refTable",
       con.confdeltype::text AS "onDelete", con.confupdtype::text AS "onUpdate",
       (SELECT json_agg(a.attname::text ORDER BY k.ord)::text FROM unnest(con.conkey) WITH ORDINALITY AS k(attnum, ord)
          JOIN pg_attribute a ON a.attrelid = con.conrelid AND a.attnum = k.attnum) AS "columns",
       (SELECT json_agg(a.attname::text ORDER BY k.ord)::text FROM unnest(con.confkey) WITH ORDINALITY AS k(attnum, ord)
          JOIN pg_attribute a ON a.attrelid = con.confrelid AND a.attnum = k.attnum) AS "refColumns"
FROM pg_constraint con
JOIN pg_class tc ON tc.oid = con.conrelid
JOIN pg_class rc ON rc.oid = con.confrelid
JOIN pg_namespace n ON n.oid = tc.relnamespace
WHERE con.contype = 'f' AND n.nspname = current_schema()`;

const ENUMS = `
SELECT t.typname::text AS "name",
       (SELECT json_agg(e.enumlabel::text ORDER BY e.enumsortorder)::text FROM pg_enum e WHERE e.enumtypid = t.oid) AS "values"
FROM pg_type t JOIN pg_namespace n ON n.oid = t.typnamespace
WHERE t.typtype = 'e' AND n.nspname = current_schema()`;

const TABLES = `
SELECT c.relname::text AS "table" FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
WHERE n.nspname = current_schema() AND c.relkind IN ('r', 'p') AND c.relname <> '_prisma_migrations'`;

/** pg_constraint.confdeltype / confupdtype codes (PostgreSQL docs, pg_constraint). */
const ACTION_CODES: Record<string, string> = { a: 'NO ACTION', r: 'RESTRICT', c: 'CASCADE', n: 'SET NULL', d: 'SET DEFAULT' };

export async function catalogShape(query: CatalogQuery): Promise<SchemaShape> {
  const shape: SchemaShape = { tables: {}, enums: {} };
  const table = (name: string) => (shape.tables[name] ??= { columns: {}, indexes: {}, foreignKeys: {} });
  for (const r of await query(TABLES)) table(String(r.table));
  for (const r of await query(COLUMNS)) {
    const isEnum = r.typtype === 'e';
    const isEnumList = r.elemTyptype === 'e';
    const type = isEnum ? `enum:${r.typname}` : isEnumList ? `enum:${r.elemTypname}[]` : String(r.type);
    table(String(r.table)).columns[String(r.column)] = {
      type,
      nullable: r.elemTypname != null ? null : r.nullable === true,
      default: parseDefault(r.defaultExpr as string | null, String(r.identity ?? '')),
    };
  }
  for (const r of await query(INDEXES)) {
    table(String(r.table)).indexes[String(r.name)] = {
      primary: r.primary === true,
      unique: r.unique === true,
      columns: JSON.parse(String(r.columns ?? '[]')) as string[],
      method: String(r.method),
    };
  }
  for (const r of await query(FOREIGN_KEYS)) {
    table(String(r.table)).foreignKeys[String(r.name)] = {
      columns: JSON.parse(String(r.columns)) as string[],
      refTable: String(r.refTable),
      refColumns: JSON.parse(String(r.refColumns)) as string[],
      onDelete: ACTION_CODES[String(r.onDelete)] ?? String(r.onDelete),
      onUpdate: ACTION_CODES[String(r.onUpdate)] ?? String(r.onUpdate),
    };
  }
  for (const r of await query(ENUMS)) shape.enums[String(r.name)] = JSON.parse(String(r.values ?? '[]')) as string[];
  return shape;
}

/** Turns pg_get_expr() text of a column default into the shape schema-shape.ts expects. */
export function parseDefault(expr: string | null, identity = ''): DefaultShape {
  if (identity === 'a' || identity === 'd') return { kind: 'autoincrement' };
  if (expr === null) return { kind: 'none' };
  if (/^nextval\(/i.test(expr)) return { kind: 'autoincrement' };
  if (/^(CURRENT_TIMESTAMP|now\(\))/i.test(expr)) return { kind: 'now' };
  const literal = parseLiteral(expr);
  return literal === undefined ? { kind: 'expression' } : { kind: 'value', value: literal };
}

function parseLiteral(expr: string): unknown {
  const text = expr.trim();
  const quoted = /^'((?:[^']|'')*)'(?:::[\w\s."[\]()]+)?$/.exec(text);
  if (quoted) return quoted[1]!.replace(/''/g, "'");
  const array = /^ARRAY\[(.*?)\](?:::[\w\s."()]+(?:\[\])*)?$/s.exec(text);
  if (array) {
    const inner = array[1]!.trim();
    return inner === '' ? [] : inner.split(/,\s*(?=(?:[^']*'[^']*')*[^']*$)/).map((item) => parseLiteral(item));
  }
  const number = /^\(?(-?\d+(?:\.\d+)?(?:e[+-]?\d+)?)\)?(?:::[\w\s."]+)?$/i.exec(text);
  if (number) return Number(number[1]);
  if (text === 'true' || text === 'false') return text === 'true';
  return undefined;
}
