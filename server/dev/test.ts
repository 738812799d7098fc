/**
 * `npm test`: a throwaway PostgreSQL cluster (own port, own folder), Chromium for the browser tests,
 * the client build, every vitest test, teardown, and a last line `N passed, N failed` read from
 * vitest's JSON report.
 */
import { spawnSync, execFileSync } from 'node:child_process'
import { existsSync, mkdtempSync, readFileSync, rmSync, chmodSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { ensureDatabase, freePort, startCluster } from './cluster'
import { buildClientIfStale } from './build-client'

const say = (m: string) => console.log(`[test] ${m}`)
export const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium'

function ensureChromium() {
  if (existsSync(CHROMIUM)) return
  if (process.getuid?.() !== 0) {
    throw new Error(`Browser tests need Debian's chromium at ${CHROMIUM}: sudo apt-get update && sudo apt-get install -y chromium`)
  }
  say("Installing Debian's chromium for the browser tests (apt-get)…")
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  execFileSync('apt-get', ['update'], { stdio: 'inherit', env })
  execFileSync('apt-get', ['install', '-y', 'chromium'], { stdio: 'inherit', env })
}

async function main(): Promise<number> {
  const home = mkdtempSync(join(tmpdir(), 'roomwright-test-'))
  chmodSync(home, 0o755)
  const port = await freePort()
  const cluster = await startCluster({ dir: join(home, 'pg'), port, say })
  const report = join(home, 'vitest.json')
  try {
    await ensureDatabase(cluster.url('postgres'), 'roomwright_test')
    ensureChromium()
    if (process.env.SKIP_CLIENT_BUILD !== '1') buildClientIfStale(say)
    const args = ['node_modules/vitest/vitest.mjs', 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...process.argv.slice(2)]
    const r = spawnSync(process.execPath, args, {
      stdio: 'inherit',
      env: {
        ...process.env,
        NODE_ENV: 'test',
        DATABASE_URL: cluster.url('roomwright_test'),
        PG_ADMIN_URL: cluster.url('postgres'),
        STORAGE_DIR: join(home, 'storage'),
        CHROMIUM_PATH: CHROMIUM,
        TEST_TMP: home,
        LOGIN_RATE_LIMIT: process.env.LOGIN_RATE_LIMIT ?? '100000',
        SIGN_IN_FAILURES_PER_ACCOUNT: process.env.SIGN_IN_FAILURES_PER_ACCOUNT ?? '100000',
        MESSAGE_RATE_LIMIT: process.env.MESSAGE_RATE_LIMIT ?? '10000000',
        UPLOAD_RATE_LIMIT: process.env.UPLOAD_RATE_LIMIT ?? '10000000',
        PREVIEW_RATE_LIMIT: process.env.PREVIEW_RATE_LIMIT ?? '10000000',
        SUBWOOFER_RATE_LIMIT: process.env.SUBWOOFER_RATE_LIMIT ?? '10000000',
        SEARCH_RATE_LIMIT: process.env.SEARCH_RATE_LIMIT ?? '10000000',
        ROOM_SAVE_RATE_LIMIT: process.env.ROOM_SAVE_RATE_LIMIT ?? '10000000',
        REPORT_RATE_LIMIT: process.env.REPORT_RATE_LIMIT ?? '10000000',
      },
    })
    let passed = 0, failed = 0, skipped = 0
    if (existsSync(report)) {
      const j = JSON.parse(readFileSync(report, 'utf8')) as { numPassedTests: number; numFailedTests: number; numPendingTests: number; numTodoTests: number; numFailedTestSuites: number }
      passed = j.numPassedTests
      failed = j.numFailedTests + (j.numFailedTests === 0 && j.numFailedTestSuites > 0 ? j.numFailedTestSuites : 0)
      skipped = j.numPendingTests + j.numTodoTests
    } else failed = 1
    if (skipped) console.log(`${skipped} skipped`)
    console.log(`${passed} passed, ${failed} failed`)
    return r.status === 0 && failed === 0 ? 0 : 1
  } finally {
    cluster.stop()
    rmSync(home, { recursive: true, force: true })
  }
}

main().then(
  (code) => process.exit(code),
  (e) => {
    console.error(e)
    console.log('0 passed, 1 failed')
    process.exit(1)
  },
)
