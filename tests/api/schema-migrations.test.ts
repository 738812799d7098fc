/**
 * The migrations (QueryInterface, raw SQL only where it cannot say a thing) build the same schema as the
 * SQL-text migrations they replaced (a copy kept in tests/fixtures/legacy-migrations): columns, constraints,
 * indexes, enum types, functions and triggers compared from PostgreSQL's own catalogs. And a database built
 * by the legacy migrations, holding demo-like rows, is taken forward by today's migrations without losing them.
 */
import { afterAll, describe, expect, it } from 'vitest'
import { Sequelize, QueryTypes } from 'sequelize'
import pg from 'pg'
import { randomBytes } from 'node:crypto'
import { join } from 'node:path'
import { migrator } from '../../server/db/migrate'

const admin = process.env.PG_ADMIN_URL!
const legacyDir = join(import.meta.dirname, '../fixtures/legacy-migrations')
const created: string[] = []
const open: Sequelize[] = []

async function freshDatabase(tag: string): Promise<Sequelize> {
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
  return s
}

afterAll(async () => {
  for (const s of open) await s.close()
  const c = new pg.Client({ connectionString: admin })
  await c.connect()
  for (const n of created) await c.query(`DROP DATABASE IF EXISTS "${n}" WITH (FORCE)`)
  await c.end()
}, 30_000)

async function catalog(s: Sequelize) {
  const q = (sql: string) => s.query(sql, { type: QueryTypes.SELECT })
  return {
    columns: await q(`SELECT table_name, column_name, ordinal_position, data_type, udt_name, is_nullable, column_default, character_maximum_length,
                             numeric_precision, datetime_precision, is_generated, generation_expression, collation_name
                        FROM information_schema.columns WHERE table_schema = 'public' ORDER BY table_name, ordinal_position`),
    constraints: await q(`SELECT c.conrelid::regclass::text AS table_name, c.conname, c.contype, pg_get_constraintdef(c.oid) AS def
                            FROM pg_constraint c JOIN pg_namespace n ON n.oid = c.connamespace WHERE n.nspname = 'public'
                           ORDER BY 1, 2`),
    indexes: await q(`SELECT tablename, indexname, indexdef FROM pg_indexes WHERE schemaname = 'public' ORDER BY tablename, indexname`),
    enums: await q(`SELECT t.typname, array_agg(e.enumlabel ORDER BY e.enumsortorder)::text AS labels
                      FROM pg_type t JOIN pg_enum e ON e.enumtypid = t.oid GROUP BY t.typname ORDER BY t.typname`),
    functions: await q(`SELECT p.proname, pg_get_function_arguments(p.oid) AS args, md5(p.prosrc) AS src FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace
                         WHERE n.nspname = 'public' ORDER BY 1, 2`),
    triggers: await q(`SELECT tgrelid::regclass::text AS table_name, tgname, pg_get_triggerdef(oid) AS def FROM pg_trigger WHERE NOT tgisinternal ORDER BY 1, 2`),
  }
}

describe('migrations', () => {
  it('build the same schema as the earlier SQL-text migrations (information_schema, pg_constraint, pg_indexes)', async () => {
    const legacy = await freshDatabase('legacy')
    const current = await freshDatabase('current')
    await migrator(legacy, legacyDir).up()
    await migrator(current).up()
    const [a, b] = [await catalog(legacy), await catalog(current)]
    expect(a.columns.length).toBeGreaterThan(100)
    expect(b.columns).toEqual(a.columns)
    expect(b.constraints).toEqual(a.constraints)
    expect(b.indexes).toEqual(a.indexes)
    expect(b.enums).toEqual(a.enums)
    expect(b.functions).toEqual(a.functions)
    expect(b.triggers).toEqual(a.triggers)
  }, 120_000)

  it('take a database of the earlier version with its rows forward without losing any', async () => {
    const s = await freshDatabase('upgrade')
    const legacyNames = (await migrator(s, legacyDir).pending()).map((m) => m.name)
    // The earlier version: the legacy migrations before the last one, then demo-like rows, then today's migrations.
    await migrator(s, legacyDir).up({ to: legacyNames[legacyNames.length - 2] })
    const [u] = await s.query<{ id: string }>(`INSERT INTO users (email, name, role) VALUES ('ines.upgrade@example.test', 'Ines Upgrade', 'listener') RETURNING id`, { type: QueryTypes.SELECT })
    const [r] = await s.query<{ id: string }>(`INSERT INTO rooms (owner_id, name) VALUES ($1, 'Attic listening room') RETURNING id`, { bind: [u.id], type: QueryTypes.SELECT })
    await s.query(`INSERT INTO room_revisions (room_id, revision, body, created_by) VALUES ($1, 1, '{"name":"Attic listening room","length":6.2}', $2)`, { bind: [r.id, u.id] })
    const [c] = await s.query<{ id: string }>(
      `INSERT INTO cases (listener_id, room_id, room_revision, title, description, reply_token, status) VALUES ($1, $2, 1, 'Flutter between the rafters', 'Slap echo', 'tok-upgrade-1', 'submitted') RETURNING id`,
      { bind: [u.id, r.id], type: QueryTypes.SELECT },
    )
    await s.query(`INSERT INTO messages (case_id, author_id, body, internal) VALUES ($1, $2, 'Claps ring for a second', false)`, { bind: [c.id, u.id] })
    await s.query(`INSERT INTO reply_snippets (title, body) VALUES ('Upgrade greeting', 'Hello {{listener.name}}')`)
    const count = async () =>
      s.query<{ t: string; n: number }>(
        `SELECT 'users' AS t, count(*)::int AS n FROM users UNION ALL SELECT 'rooms', count(*)::int FROM rooms UNION ALL SELECT 'room_revisions', count(*)::int FROM room_revisions
         UNION ALL SELECT 'cases', count(*)::int FROM cases UNION ALL SELECT 'messages', count(*)::int FROM messages UNION ALL SELECT 'reply_snippets', count(*)::int FROM reply_snippets`,
        { type: QueryTypes.SELECT },
      )
    const before = await count()
    const applied = (await migrator(s).up()).map((m) => m.name)
    expect(applied).toEqual([legacyNames[legacyNames.length - 1]])
    expect(await count()).toEqual(before)
    const [after] = await s.query<{ title: string; search: string }>(`SELECT title, search::text AS search FROM cases WHERE id = $1`, { bind: [c.id], type: QueryTypes.SELECT })
    expect(after.title).toBe('Flutter between the rafters')
    expect(after.search).toContain('rafter')
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
