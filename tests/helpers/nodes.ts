import { afterAll } from 'vitest'

/**
 * Several app instances over one database, as several processes behind a balancer would be: each has
 * its own limiter objects and memory caches, so what they share can only be what PostgreSQL holds.
 * `env` is set before the configuration is read (the limiters read it when an app is built); `more`
 * builds a further node with overrides of its own. Every node, and the database pool, is closed after the file.
 */
export async function appNodes(env: Record<string, string>, count = 2) {
  Object.assign(process.env, env)
  const { setConfigForTests, loadConfig } = await import('../../server/config')
  setConfigForTests(loadConfig())
  const { createApp } = await import('../../server/app')
  const { closeDb } = await import('../../server/db/sequelize')
  const built = Array.from({ length: count }, () => createApp({ clientDir: false }))
  afterAll(async () => {
    for (const n of built) await n.close()
    await closeDb()
  })
  const more = (overrides: Record<string, string>) => {
    setConfigForTests(loadConfig({ ...process.env, ...overrides }))
    const node = createApp({ clientDir: false })
    setConfigForTests(loadConfig())
    built.push(node)
    return node
  }
  return { nodes: built.slice(), more }
}
