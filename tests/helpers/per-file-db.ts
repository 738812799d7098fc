/**
 * Vitest setup file: every test file gets its own database, cloned from the migrated test database
 * (CREATE DATABASE … TEMPLATE), so job workers, mail and figures of one file never meet another's.
 * Runs before the file's own imports are evaluated; config() reads DATABASE_URL lazily.
 */
import { afterAll } from 'vitest'
import pg from 'pg'
import { randomBytes } from 'node:crypto'

const admin = process.env.PG_ADMIN_URL
const template = process.env.TEMPLATE_DATABASE_URL ?? process.env.DATABASE_URL
if (admin && template && !process.env.RW_FILE_DB) {
  const templateName = new URL(template).pathname.slice(1)
  const name = `${templateName}_${randomBytes(5).toString('hex')}`
  const client = new pg.Client({ connectionString: admin })
  await client.connect()
  try {
    // Two files cloning at the same instant collide on the template ("being accessed by other users"): retry.
    for (let attempt = 0; ; attempt++) {
      try {
        await client.query(`CREATE DATABASE "${name}" TEMPLATE "${templateName}"`)
        break
      } catch (e) {
        if (attempt > 40 || !/being accessed by other users/.test(String(e))) throw e
        await new Promise((r) => setTimeout(r, 100 + Math.random() * 200))
      }
    }
  } finally {
    await client.end()
  }
  const url = new URL(template)
  url.pathname = `/${name}`
  process.env.TEMPLATE_DATABASE_URL = template
  process.env.DATABASE_URL = url.toString()
  process.env.RW_FILE_DB = name

  afterAll(async () => {
    const { closeDb } = await import('../../server/db/sequelize')
    await closeDb().catch(() => {})
    const c = new pg.Client({ connectionString: admin })
    await c.connect()
    try {
      await c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`)
    } finally {
      await c.end()
    }
  }, 30_000)
}
