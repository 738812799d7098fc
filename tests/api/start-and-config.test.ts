import { describe, expect, it } from 'vitest'
import { spawn, spawnSync } from 'node:child_process'
import { mkdtempSync, rmSync, chmodSync } from 'node:fs'
import { join } from 'node:path'
import { tmpdir } from 'node:os'
import pg from 'pg'
import { loadConfig, ConfigError } from '../../server/config'
import { freePort } from '../../server/dev/cluster'

const tsx = ['--import', 'tsx']

describe('configuration is validated at start-up', () => {
  it('a PORT that is not a number stops loadConfig with a message naming PORT', () => {
    expect(() => loadConfig({ PORT: 'eighty', DATABASE_URL: 'postgres://u@127.0.0.1/db' })).toThrow(ConfigError)
    expect(() => loadConfig({ PORT: 'eighty', DATABASE_URL: 'postgres://u@127.0.0.1/db' })).toThrow(/PORT/)
  })
  it('production refuses a missing or development-default INBOUND_EMAIL_SECRET, naming the variable (issue 13, finding 6)', () => {
    const prod = { DATABASE_URL: 'postgres://u@127.0.0.1/db', NODE_ENV: 'production', SESSION_SECRET: 'a-production-session-secret-42' }
    expect(() => loadConfig(prod)).toThrow(/INBOUND_EMAIL_SECRET/)
    expect(() => loadConfig({ ...prod, INBOUND_EMAIL_SECRET: 'roomwright-development-inbound-secret' })).toThrow(/INBOUND_EMAIL_SECRET/)
    expect(() => loadConfig({ ...prod, INBOUND_EMAIL_SECRET: 'short' })).toThrow(/INBOUND_EMAIL_SECRET/)
    expect(loadConfig({ ...prod, INBOUND_EMAIL_SECRET: 'a-secret-of-our-own-9d2f' }).INBOUND_EMAIL_SECRET).toBe('a-secret-of-our-own-9d2f')
    expect(loadConfig({ DATABASE_URL: 'postgres://u@127.0.0.1/db' }).INBOUND_EMAIL_SECRET).toBe('roomwright-development-inbound-secret')
  })
  it('a DATABASE_URL that is not a postgres URL is refused', () => {
    expect(() => loadConfig({ DATABASE_URL: 'mysql://x@y/z' })).toThrow(/DATABASE_URL must be a postgres/)
  })
  it('the server process exits with code 2 and a clear message on a bad PORT', () => {
    const r = spawnSync(process.execPath, [...tsx, 'server/index.ts'], { env: { ...process.env, PORT: '70000' }, encoding: 'utf8', timeout: 100_000 })
    expect(r.status).toBe(2)
    expect(r.stderr).toMatch(/PORT: PORT must be between 0 and 65535/)
  }, 120_000)
  it('npm start refuses a bad PORT before provisioning anything', () => {
    const r = spawnSync(process.execPath, [...tsx, 'server/dev/start.ts', '--no-client'], { env: { ...process.env, DATABASE_URL: '', PORT: 'abc', RW_DATA_DIR: '/nonexistent/never-made' }, encoding: 'utf8', timeout: 100_000 })
    expect(r.status).toBe(2)
    expect(r.stderr).toMatch(/PORT/)
  }, 120_000)
})

/** Runs the start script until it prints its URL, then stops it with SIGINT (Ctrl-C). */
async function startOnce(env: NodeJS.ProcessEnv): Promise<{ output: string; code: number | string | null }> {
  const child = spawn(process.execPath, [...tsx, 'server/dev/start.ts', '--no-client'], { env, stdio: ['ignore', 'pipe', 'pipe'] })
  let output = ''
  child.stdout.on('data', (d) => (output += d))
  child.stderr.on('data', (d) => (output += d))
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`start timed out:\n${output}`)), 120_000)
    child.stdout.on('data', () => {
      if (/Press Ctrl-C to stop/.test(output)) {
        clearTimeout(timer)
        resolve()
      }
    })
    child.on('exit', () => reject(new Error(`start exited early:\n${output}`)))
  })
  const code = await new Promise<number | string | null>((resolve) => {
    child.removeAllListeners('exit')
    child.on('exit', (c, signal) => resolve(c ?? signal))
    child.kill('SIGINT')
  })
  return { output, code }
}

describe('npm start provisions once and reuses its cluster and data', () => {
  it('a second start keeps the data, and Ctrl-C stops server and cluster cleanly', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'roomwright-start-'))
    chmodSync(dir, 0o755)
    const pgPort = await freePort()
    const env = { ...process.env, DATABASE_URL: '', NODE_ENV: 'development', RW_DATA_DIR: dir, PGPORT_EMBEDDED: String(pgPort), PORT: String(await freePort()), SMTP_PORT: String(await freePort()), FAKE_SMTP: 'on' }
    delete (env as Record<string, string | undefined>).DATABASE_URL
    try {
      const first = await startOnce(env)
      expect(first.output).toMatch(/Creating a private PostgreSQL cluster/)
      expect(first.output).toMatch(/Seeded the demo scenario/)
      expect(first.output).toMatch(/listener@roomwright\.test/)
      expect(first.code, first.output).toBe(0)

      // Between the runs the cluster is down: nothing answers on its port.
      const probe = new pg.Client({ host: '127.0.0.1', port: pgPort, user: 'roomwright', database: 'roomwright', connectionTimeoutMillis: 1500 })
      await expect(probe.connect()).rejects.toThrow()

      const second = await startOnce(env)
      expect(second.output).not.toMatch(/Creating a private PostgreSQL cluster/)
      expect(second.output).not.toMatch(/Seeded the demo scenario/)
      expect(second.code, second.output).toBe(0)
    } finally {
      spawnSync('runuser', ['-u', 'postgres', '--', '/bin/true'])
      rmSync(dir, { recursive: true, force: true })
    }
  }, 300_000)
})
