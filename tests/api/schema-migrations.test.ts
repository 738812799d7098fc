/**
 * The migrations (QueryInterface, raw SQL only where it cannot say a thing) against two committed snapshots,
 * both written by server/dev/schema-snapshot.ts (see there, and DEVELOPERS.md "A migration"):
 * - tests/fixtures/schema/schema.json, the catalog (columns, constraints, indexes, enum types, functions,
 *   triggers; server/dev/schema-catalog.ts) of a fresh database: a fresh database built today must equal it,
 *   so a migration whose effect changed fails here (and every down, then every up again, comes back to it);
 * - tests/fixtures/schema/demo-earlier.sql.gz, a pg_dump of an earlier version's demo database with its rows:
 *   restored and taken forward by today's migrations, it loses no row, keeps every earlier column's
 *   values, and ends with the same schema as a fresh database.
 */
import { gunzipSync } from 'node:zlib'
import { afterAll, describe, expect, it } from 'vitest'
import { Sequelize, QueryTypes } from 'sequelize'
import pg from 'pg'
import { randomBytes } from 'node:crypto'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { migrator } from '../../server/db/migrate'
import { readCatalog, type Catalog } from '../../server/dev/schema-catalog'

const admin = process.env.PG_ADMIN_URL!
const fixtures = join(import.meta.dirname, '../fixtures/schema')
const snapshot = JSON.parse(readFileSync(join(fixtures, 'schema.json'), 'utf8')) as Catalog
const created: string[] = []
const open: Sequelize[] = []

async function freshDatabase(tag: string): Promise<{ s: Sequelize; url: string }> {
  const name = `schema_${tag}_${randomBytes(4).toString('hex')}`
  const c = new pg.Client({ connectionString: admin })
  await c.connect()
  await c.query(`CREATE DATABASE "${name}"`)
  await c.end()
  created.push(name)
  const url = new URL(admin)
  url.pathname = `/${name}`
  const s = new Sequelize(url.toString(), { dialect: 'postgres', logging: false })
  open.push(s)
  return { s, url: url.toString() }
}

afterAll(async () => {
  for (const s of open) await s.close()
  const c = new pg.Client({ connectionString: admin })
  await c.connect()
  for (const n of created) await c.query(`DROP DATABASE IF EXISTS "${n}" WITH (FORCE)`)
  await c.end()
}, 30_000)

/** Each catalog part compared on its own, so that a failure names the part (columns, indexes, …). */
function expectSameSchema(actual: Catalog, expected: Catalog) {
  for (const key of Object.keys(expected) as (keyof Catalog)[]) {
    expect(actual[key], `${key} (a new migration? then run npx tsx server/dev/schema-snapshot.ts and commit the snapshot)`).toEqual(expected[key])
  }
  expect(Object.keys(actual).sort()).toEqual(Object.keys(expected).sort())
}

/**
 * Per table: its row count and a checksum of the given columns over all rows (raw SQL: a checksum of whole
 * tables, which the models do not describe; the table and column names come from the catalog).
 */
async function tableSums(s: Sequelize, columns: Record<string, unknown>[]) {
  const byTable = new Map<string, string[]>()
  for (const c of columns) byTable.set(String(c.table_name), [...(byTable.get(String(c.table_name)) ?? []), String(c.column_name)])
  const parts = [...byTable].map(([t, cols]) => {
    const row = `row(${cols.map((c) => `"${c}"`).join(', ')})::text`
    return `SELECT '${t}' AS t, count(*)::int AS n, md5(coalesce(string_agg(${row}, E'\\n' ORDER BY ${row}), '')) AS sum FROM "${t}"`
  })
  return s.query<{ t: string; n: number; sum: string }>(`${parts.join(' UNION ALL ')} ORDER BY 1`, { type: QueryTypes.SELECT })
}

/**
 * pg_dump writes a check `col IN ('a', 'b')` on a varchar back as `(ARRAY['a'::character varying, …])::text[]`,
 * which PostgreSQL reads in again as `ARRAY[('a'::character varying)::text, …]`: the same check, spelled
 * otherwise after a restore. This spells every such check the restored way, on both sides of the comparison.
 */
function asRestored(c: Catalog): Catalog {
  const respell = (def: string) =>
    def.replace(/\(ARRAY\[([^\]]*)\]\)::([a-z ]+)\[\]/g, (_, items: string, type: string) => `ARRAY[${items.split(', ').map((i) => `(${i})::${type}`).join(', ')}]`)
  return { ...c, constraints: c.constraints.map((r) => ({ ...r, def: respell(String(r.def)) })) }
}

describe('migrations', () => {
  it('build a fresh database equal to the committed schema snapshot (information_schema, pg_constraint, pg_indexes, pg_enum, pg_proc, pg_trigger, pg_extension)', async () => {
    const { s } = await freshDatabase('fresh')
    await migrator(s).up()
    const catalog = await readCatalog(s)
    expect(snapshot.columns.length).toBeGreaterThan(100)
    expect(snapshot.indexes.length).toBeGreaterThan(50)
    expectSameSchema(catalog, snapshot)
  }, 120_000)

  it('undo to an empty database and redo to the same schema (every down, then every up again)', async () => {
    const { s } = await freshDatabase('redo')
    await migrator(s).up()
    await migrator(s).down({ to: 0 })
    const left = await readCatalog(s)
    // Only umzug's own ledger stays (and the pgcrypto extension, which 0001's down leaves in place).
    expect([...new Set(left.columns.map((c) => c.table_name))]).toEqual(['schema_migrations'])
    expect(left.enums).toEqual([])
    expect(left.triggers).toEqual([])
    expect(left.functions).toEqual([])
    await migrator(s).up()
    expectSameSchema(await readCatalog(s), snapshot)
  }, 120_000)

  it('take the demo database of an earlier version forward without losing a row or a value', async () => {
    const { s, url } = await freshDatabase('upgrade')
    // The dump is plain SQL (INSERTs) run as one script on a connection of its own (it empties search_path).
    const c = new pg.Client({ connectionString: url })
    await c.connect()
    await c.query(gunzipSync(readFileSync(join(fixtures, 'demo-earlier.sql.gz'))).toString('utf8'))
    await c.end()

    // Snippets that an advisor wrote on the earlier version (its seed had none), so that 0050 meets rows.
    // Raw SQL: the earlier schema, which today's models do not describe.
    await s.query(`INSERT INTO reply_snippets (title, body, created_by) SELECT 'Bass trap sizes, from ' || name, 'Hello {{listener.name}}', id FROM users WHERE role = 'advisor' ORDER BY email LIMIT 3`)

    // Every earlier column but the migrations' own ledger, which grows by what is applied (checked below).
    const earlier = (await readCatalog(s)).columns.filter((c) => c.table_name !== 'schema_migrations')
    const before = await tableSums(s, earlier)
    const count = (t: string) => before.find((r) => r.t === t)?.n ?? 0
    // A demo database worth the name: the seed's people, rooms, cases and their messages (and the snippets above).
    for (const t of ['users', 'rooms', 'cases', 'messages', 'case_events', 'reply_snippets']) expect(count(t), t).toBeGreaterThan(2)

    const recorded = await s.query<{ name: string }>('SELECT name FROM schema_migrations ORDER BY name', { type: QueryTypes.SELECT })
    const pending = (await migrator(s).pending()).map((m) => m.name)
    expect(pending.length, 'the demo snapshot should be of an earlier version (server/dev/schema-snapshot.ts --demo REV)').toBeGreaterThan(0)
    const applied = (await migrator(s).up()).map((m) => m.name)
    expect(applied).toEqual(pending)
    expect(await tableSums(s, earlier)).toEqual(before)
    expect((await tableSums(s, [{ table_name: 'schema_migrations', column_name: 'name' }]))[0].n).toBe(recorded.length + applied.length)

    // The seed's own ledger (demo_seeds) is the one table a fresh database does not have.
    expectSameSchema(asRestored(await readCatalog(s, ['demo_seeds'])), asRestored(snapshot))
    if (applied.includes('0050-personal-and-team-snippets')) {
      // 0050: the snippets that existed before were everyone's, so they became team snippets.
      const scopes = await s.query<{ scope: string; n: number }>('SELECT scope, count(*)::int AS n FROM reply_snippets GROUP BY scope', { type: QueryTypes.SELECT })
      expect(scopes).toEqual([{ scope: 'team', n: count('reply_snippets') }])
    }
  }, 120_000)
})

describe('models', () => {
  it('every application table has a model, and every model attribute is a column of its table', async () => {
    const { models } = await import('../../server/db/models')
    const { db } = await import('../../server/db/sequelize')
    const cols = await db().query<{ table_name: string; column_name: string }>(
      `SELECT table_name, column_name FROM information_schema.columns WHERE table_schema = 'public'`, { type: QueryTypes.SELECT })
    // Library tables: umzug's ledger and the socket.io adapter's payload table have no model.
    const library = new Set(['schema_migrations', 'socket_io_attachments'])
    const tables = new Set(cols.map((c) => c.table_name).filter((t) => !library.has(t)))
    const byTable = new Map((Object.values(models()) as unknown as typeof import("sequelize").Model[] as never as { getTableName(): string; getAttributes(): Record<string, { field: string }> }[]).map((m) => [m.getTableName(), m]))
    expect([...tables].sort()).toEqual([...byTable.keys()].sort())
    for (const [table, m] of byTable) {
      const have = new Set(cols.filter((c) => c.table_name === table).map((c) => c.column_name))
      for (const a of Object.values(m.getAttributes())) expect(have, `${table}.${a.field}`).toContain(a.field)
    }
  })
})
