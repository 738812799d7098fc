import { ConfigError, config } from './config'
import { migrateUp } from './db/migrate'
import { startServer } from './server'
import { log } from './lib/log'

/** Entry point for a plain server process (DATABASE_URL given): migrate, listen, stop cleanly on a signal. */
try {
  config()
} catch (e) {
  if (e instanceof ConfigError) {
    console.error(e.message)
    process.exit(2)
  }
  throw e
}
await migrateUp()
const server = await startServer()
log.info('listening', { url: server.url })
console.log(`Roomwright is listening on ${server.url}`)
for (const sig of ['SIGINT', 'SIGTERM'] as const) {
  process.once(sig, () => {
    server.close().then(() => process.exit(0), () => process.exit(1))
  })
}
