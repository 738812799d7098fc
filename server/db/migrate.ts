import { readdirSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { Umzug, SequelizeStorage } from 'umzug'
import type { QueryInterface, Sequelize } from 'sequelize'
import { db } from './sequelize'
import { withAdvisoryLock } from './advisory-lock'

const here = dirname(fileURLToPath(import.meta.url))
export const migrationsDir = join(here, 'migrations')

export type Migration = { up: (ctx: { context: QueryInterface }) => Promise<void>; down: (ctx: { context: QueryInterface }) => Promise<void> }

/**
 * Where umzug records applied migrations. The model name is our own: umzug's default model name
 * (`SequelizeMeta`) is shared by every SequelizeStorage on one Sequelize instance, so the demo seed's
 * storage reused this one and recorded its steps in schema_migrations instead of demo_seeds.
 */
export function migrationStorage(sequelize: Sequelize = db()): SequelizeStorage {
  return new SequelizeStorage({ sequelize, modelName: 'SchemaMigration', tableName: 'schema_migrations' })
}

/**
 * Migrations are numbered files `NNNN-what-it-does.ts` in server/db/migrations, applied in name order.
 * `sequelize` is for the schema snapshot and its test (a database of their own).
 */
export function migrator(sequelize: Sequelize = db()) {
  const files = readdirSync(migrationsDir)
    .filter((f) => /^\d{4}-[a-z0-9-]+\.ts$/.test(f))
    .sort()
  return new Umzug<QueryInterface>({
    migrations: files.map((file) => ({
      name: file.replace(/\.ts$/, ''),
      up: async ({ context }) => ((await import(pathToFileURL(join(migrationsDir, file)).href)) as Migration).up({ context }),
      down: async ({ context }) => ((await import(pathToFileURL(join(migrationsDir, file)).href)) as Migration).down({ context }),
    })),
    context: sequelize.getQueryInterface(),
    storage: migrationStorage(sequelize),
    logger: undefined,
  })
}

/** Applies every pending migration; safe to call on every start (a lock keeps two processes apart). */
export async function migrateUp(): Promise<string[]> {
  // Serialise concurrent start-ups (several nodes, or parallel test workers) on an advisory lock.
  return withAdvisoryLock(727001, async () => (await migrator().up()).map((m) => m.name))
}

export async function migrateDown(to?: string): Promise<void> {
  await migrator().down(to ? { to } : undefined)
}
