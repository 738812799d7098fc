/**
 * `npm start`: a private PostgreSQL cluster (unless DATABASE_URL is given), migrations, the demo
 * scenario on first run, the client build, the local fake mail server, and one server process.
 * Ctrl-C stops the server and the cluster.
 */
import { join, resolve } from 'node:path'
import { ClusterError, ensureDatabase, startCluster, type Cluster } from './cluster'
import { buildClientIfStale } from './build-client'

const say = (m: string) => console.log(`[roomwright] ${m}`)
const noClient = process.argv.includes('--no-client')
/** Where the embedded cluster and uploads live (git-ignored); RW_DATA_DIR moves it. */
const dataDir = resolve(process.env.RW_DATA_DIR ?? '.data')

async function main() {
  const { loadConfig, ConfigError } = await import('../config')
  // Check what we can before provisioning anything, so a bad PORT stops us at once.
  try {
    loadConfig({ DATABASE_URL: 'postgres://check@127.0.0.1/check', ...process.env })
  } catch (e) {
    if (e instanceof ConfigError) {
      console.error(e.message)
      process.exit(2)
    }
    throw e
  }

  let cluster: Cluster | undefined
  const embedded = !process.env.DATABASE_URL
  if (embedded) {
    const port = Number(process.env.PGPORT_EMBEDDED ?? 5544)
    cluster = await startCluster({ dir: join(dataDir, 'pg'), port, say })
    await ensureDatabase(cluster.url('postgres'), 'roomwright')
    process.env.DATABASE_URL = cluster.url('roomwright')
    process.env.FAKE_SMTP ??= 'on'
    say(`PostgreSQL is running on 127.0.0.1:${port} (data in ${join(dataDir, 'pg')})`)
  }
  process.env.STORAGE_DIR ??= join(dataDir, 'storage')

  const stopCluster = () => {
    if (cluster) {
      say('Stopping PostgreSQL…')
      cluster.stop()
      cluster = undefined
    }
  }
  try {
    const { config } = await import('../config')
    config()
    const { migrateUp } = await import('../db/migrate')
    const applied = await migrateUp()
    if (applied.length) say(`Applied migrations: ${applied.join(', ')}`)
    if (embedded || process.env.SEED_DEMO === 'on') {
      const { seedDemo } = await import('../seed')
      const seeded = await seedDemo()
      if (seeded.length) say(`Seeded the demo scenario: ${seeded.join(', ')}`)
    }
    if (!noClient) buildClientIfStale(say)
    const { maybeStartFakeSmtp } = await import('../mail/fake-smtp')
    const smtp = await maybeStartFakeSmtp()
    if (smtp) say(`Fake mail server on 127.0.0.1:${smtp.port}: supervisors read it at /mailbox`)
    const { startServer } = await import('../server')
    const server = await startServer()
    // Ctrl-C handling is in place before anything is printed, so a signal right after the URL appears is handled.
    let stopping = false
    for (const sig of ['SIGINT', 'SIGTERM'] as const) {
      process.on(sig, () => {
        if (stopping) return
        stopping = true
        say('Stopping…')
        Promise.all([server.close(), smtp?.stop()])
          .catch((e) => console.error(e))
          .finally(() => {
            stopCluster()
            process.exit(0)
          })
      })
    }
    const { DEMO_PASSWORD, demoPeople } = await import('../seed/people')
    console.log(`\nRoomwright is running at ${server.url.replace('127.0.0.1', 'localhost')}\n`)
    if (embedded) {
      console.log(`Demo sign-ins (password "${DEMO_PASSWORD}" for all):`)
      for (const p of demoPeople.slice(0, 3)) console.log(`  ${p.role.padEnd(10)} ${p.email}`)
      console.log('  … and more listeners and an advisor; see the README.\n')
    }
    console.log('Press Ctrl-C to stop.')
  } catch (e) {
    stopCluster()
    throw e
  }
}

main().catch((e) => {
  if (e instanceof ClusterError || e?.constructor?.name === 'ConfigError') console.error(e.message)
  else console.error(e)
  process.exit(1)
})
