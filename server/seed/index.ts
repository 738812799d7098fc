import { readdirSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { Umzug, SequelizeStorage } from 'umzug'
import { db } from '../db/sequelize'
import { withAdvisoryLock } from '../db/advisory-lock'

const stepsDir = join(dirname(fileURLToPath(import.meta.url)), 'steps')

/**
 * The demo scenario (invented people, rooms and cases) is seeded in numbered steps, recorded like
 * migrations in `demo_seeds`: the first start applies them all, later starts only the new ones,
 * and data people changed is never seeded over. Only `npm start` on its own database calls this.
 */
export async function seedDemo(): Promise<string[]> {
  const sequelize = db()
  const files = readdirSync(stepsDir).filter((f) => /^\d{4}-[a-z0-9-]+\.ts$/.test(f)).sort()
  const umzug = new Umzug({
    migrations: files.map((file) => ({
      name: file.replace(/\.ts$/, ''),
      up: async () => (await import(pathToFileURL(join(stepsDir, file)).href)).seed(),
    })),
    context: {},
    storage: new SequelizeStorage({ sequelize, tableName: 'demo_seeds' }),
    logger: undefined,
  })
  return withAdvisoryLock(727002, async () => (await umzug.up()).map((m) => m.name))
}
