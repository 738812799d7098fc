/**
 * The demo seed's steps are recorded in demo_seeds and the migrations in schema_migrations, each by
 * its own umzug storage. Both storages once shared umzug's default model name, so the seed's steps
 * landed in schema_migrations; a database seeded that way is repaired without being seeded twice.
 */
import { describe, expect, it } from 'vitest'
import { readdirSync } from 'node:fs'
import { join } from 'node:path'
import { SequelizeStorage } from 'umzug'
import { db } from '../../server/db/sequelize'
import { migrateUp, migrationStorage } from '../../server/db/migrate'
import { seedDemo } from '../../server/seed/index'

const steps = readdirSync(join(import.meta.dirname, '../../server/seed/steps')).filter((f) => /^\d{4}-.*\.ts$/.test(f)).map((f) => f.replace(/\.ts$/, '')).sort()
const seeds = () => new SequelizeStorage({ sequelize: db(), modelName: 'DemoSeedInTest', tableName: 'demo_seeds' })

describe('demo seed records', () => {
  it('a first start records every step in demo_seeds, none in schema_migrations, and a second start seeds nothing', async () => {
    // as `npm start` does: the migrations first (their storage is defined on the instance), then the seed
    await migrateUp()
    expect(await seedDemo()).toEqual(steps)
    expect((await seeds().executed()).sort()).toEqual(steps)
    const migrations = await migrationStorage().executed()
    expect(migrations.length).toBeGreaterThan(5)
    expect(migrations.filter((m) => steps.includes(m))).toEqual([])
    expect(await seedDemo()).toEqual([])
  }, 600_000)

  it('moves the steps that an earlier version recorded in schema_migrations, and seeds nothing over them', async () => {
    // the earlier version's records: the steps in schema_migrations, demo_seeds holding only the first two
    const s = seeds()
    for (const name of steps.slice(2)) await s.unlogMigration({ name })
    for (const name of steps) await migrationStorage().logMigration({ name })
    expect(await seedDemo()).toEqual([])
    expect((await seeds().executed()).sort()).toEqual(steps)
    expect((await migrationStorage().executed()).filter((m) => steps.includes(m))).toEqual([])
  }, 600_000)
})
