/**
 * What a migration can change in a database, read from PostgreSQL's own catalogs (information_schema,
 * pg_constraint, pg_indexes, pg_enum, pg_proc, pg_trigger, pg_extension) as plain rows. The schema test compares a
 * fresh database with the committed snapshot (tests/fixtures/schema/schema.json) through this, and
 * server/dev/schema-snapshot.ts writes that snapshot with it.
 * Raw SQL: catalog queries, which the ORM has no models for.
 */
import { QueryTypes, type Sequelize } from 'sequelize'

export type Catalog = Record<'columns' | 'constraints' | 'indexes' | 'enums' | 'functions' | 'triggers' | 'extensions', Record<string, unknown>[]>

const queries: Record<keyof Catalog, string> = {
  columns: `SELECT table_name, column_name, ordinal_position, data_type, udt_name, is_nullable, column_default, character_maximum_length,
                   numeric_precision, datetime_precision, is_generated, generation_expression, collation_name
              FROM information_schema.columns WHERE table_schema = 'public' ORDER BY table_name, ordinal_position`,
  constraints: `SELECT c.conrelid::regclass::text AS table_name, c.conname, c.contype, pg_get_constraintdef(c.oid) AS def
                  FROM pg_constraint c JOIN pg_namespace n ON n.oid = c.connamespace WHERE n.nspname = 'public' ORDER BY 1, 2`,
  indexes: `SELECT tablename, indexname, indexdef FROM pg_indexes WHERE schemaname = 'public' ORDER BY tablename, indexname`,
  enums: `SELECT t.typname, array_agg(e.enumlabel ORDER BY e.enumsortorder)::text AS labels
            FROM pg_type t JOIN pg_enum e ON e.enumtypid = t.oid GROUP BY t.typname ORDER BY t.typname`,
  // Our own functions in full (arguments, result, language, volatility, body); an extension's own (pgcrypto's)
  // are left out, they come with the extension and its version, listed by name only.
  functions: `SELECT p.proname, pg_get_function_arguments(p.oid) AS args, pg_get_functiondef(p.oid) AS def
                FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace
               WHERE n.nspname = 'public' AND NOT EXISTS (SELECT 1 FROM pg_depend d WHERE d.objid = p.oid AND d.deptype = 'e')
               ORDER BY 1, 2`,
  extensions: `SELECT extname FROM pg_extension ORDER BY 1`,
  triggers: `SELECT tgrelid::regclass::text AS table_name, tgname, pg_get_triggerdef(oid) AS def FROM pg_trigger WHERE NOT tgisinternal ORDER BY 1, 2`,
}

/** The schema of `s` (schema `public`), leaving out the tables named in `without` (e.g. the seed's own ledger). */
export async function readCatalog(s: Sequelize, without: string[] = []): Promise<Catalog> {
  const out = {} as Catalog
  for (const [key, sql] of Object.entries(queries) as [keyof Catalog, string][]) {
    // raw SQL: PostgreSQL's own catalogues (information_schema, pg_indexes, pg_trigger…), which no model describes
    const rows = await s.query<Record<string, unknown>>(sql, { type: QueryTypes.SELECT })
    out[key] = rows.filter((r) => !without.includes(String(r.table_name ?? r.tablename ?? '')))
  }
  return out
}
