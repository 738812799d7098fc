/**
 * The bench database: DATABASE_URL when set, else a throwaway PostgreSQL cluster of our own
 * (server/dev/cluster.ts) in a temp folder, stopped and removed when the process exits.
 */
import { mkdtempSync, rmSync, chmodSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { ensureDatabase, freePort, startCluster } from '../../server/dev/cluster'

let ready: Promise<string> | undefined

export function benchDatabase(): Promise<string> {
  ready ??= (async () => {
    if (!process.env.DATABASE_URL) {
      const home = mkdtempSync(join(tmpdir(), 'roomwright-bench-'))
      chmodSync(home, 0o755)
      const cluster = await startCluster({ dir: join(home, 'pg'), port: await freePort(), say: (m) => console.error(`[bench] ${m}`) })
      process.on('exit', () => {
        cluster.stop()
        rmSync(home, { recursive: true, force: true })
      })
      await ensureDatabase(cluster.url('postgres'), 'roomwright_bench')
      process.env.DATABASE_URL = cluster.url('roomwright_bench')
      process.env.STORAGE_DIR ??= join(home, 'storage')
    }
    process.env.LOGIN_RATE_LIMIT ??= '1000000'
    process.env.MESSAGE_RATE_LIMIT ??= '10000000' // the bench loads one user far past a person's limit
    process.env.UPLOAD_RATE_LIMIT ??= '10000000' // the bench loads one user far past a person's limit
    process.env.PREVIEW_RATE_LIMIT ??= '10000000' // the bench loads one user far past a person's limit
    process.env.SEARCH_RATE_LIMIT ??= '10000000' // the bench loads one user far past a person's limit
    process.env.JOBS ??= 'off'
    const { migrateUp } = await import('../../server/db/migrate')
    await migrateUp()
    return process.env.DATABASE_URL!
  })()
  return ready
}

/** Percentile of a sample, nearest-rank. */
export function percentile(xs: number[], p: number): number {
  if (!xs.length) return NaN
  const s = [...xs].sort((a, b) => a - b)
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil((p / 100) * s.length) - 1))]
}

let server: Promise<import('../../server/server').RunningServer> | undefined
/**
 * One in-process server for the queue and socket benches, left running until the process exits:
 * closing it closes the process's Sequelize instance, which the data models stay bound to.
 */
export function benchServer(): Promise<import('../../server/server').RunningServer> {
  server ??= (async () => {
    await benchDatabase()
    const { startServer } = await import('../../server/server')
    return startServer({ port: 0, clientDir: false, background: false })
  })()
  return server
}
