import { readdirSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { Umzug, SequelizeStorage } from 'umzug'
import { db } from '../db/sequelize'
import { withAdvisoryLock } from '../db/advisory-lock'
import { migrationStorage } from '../db/migrate'

const stepsDir = join(dirname(fileURLToPath(import.meta.url)), 'steps')

/**
 * The demo scenario (invented people, rooms and cases) is seeded in numbered steps, recorded like
 * migrations in `demo_seeds`: the first start applies them all, later starts only the new ones,
 * and data people changed is never seeded over. Only `npm start` on its own database calls this.
 */
export async function seedDemo(): Promise<string[]> {
  const sequelize = db()
  const files = readdirSync(stepsDir).filter((f) => /^\d{4}-[a-z0-9-]+\.ts$/.test(f)).sort()
  const names = files.map((file) => file.replace(/\.ts$/, ''))
  // a model name of our own: umzug's default one is shared with the migrations' storage (see migrate.ts)
  const storage = new SequelizeStorage({ sequelize, modelName: 'DemoSeed', tableName: 'demo_seeds' })
  const umzug = new Umzug({
    migrations: files.map((file) => ({
      name: file.replace(/\.ts$/, ''),
      up: async () => (await import(pathToFileURL(join(stepsDir, file)).href)).seed(),
    })),
    context: {},
    storage,
    logger: undefined,
  })
  return withAdvisoryLock(727002, async () => {
    await moveMisrecordedSteps(storage, names)
    return (await umzug.up()).map((m) => m.name)
  })
}

/**
 * Versions before 2026-12-03 recorded the demo steps in schema_migrations (umzug's shared default
 * model name): move those records to demo_seeds, so that a database seeded by such a version is not
 * seeded a second time over its own rows.
 */
async function moveMisrecordedSteps(storage: SequelizeStorage, stepNames: string[]): Promise<void> {
  const migrations = migrationStorage()
  const misrecorded = (await migrations.executed()).filter((name) => stepNames.includes(name))
  const recorded = new Set(await storage.executed())
  for (const name of misrecorded) {
    if (!recorded.has(name)) await storage.logMigration({ name })
    await migrations.unlogMigration({ name })
  }
}
