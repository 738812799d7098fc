import { spawnSync } from 'node:child_process'
import { existsSync, readdirSync, statSync } from 'node:fs'
import { join } from 'node:path'

function newest(path: string): number {
  if (!existsSync(path)) return 0
  const st = statSync(path)
  if (!st.isDirectory()) return st.mtimeMs
  let m = st.mtimeMs
  for (const e of readdirSync(path)) m = Math.max(m, newest(join(path, e)))
  return m
}

/** Builds the client with Vite when dist/ is missing or older than its sources. */
export function buildClientIfStale(say: (m: string) => void = console.log): void {
  const built = existsSync('dist/index.html') ? statSync('dist/index.html').mtimeMs : 0
  const sources = Math.max(...['src', 'shared', 'public', 'index.html', 'vite.config.ts', 'package-lock.json'].map(newest))
  if (built && built >= sources) return
  say('Building the client (vite build)…')
  const r = spawnSync(process.execPath, ['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'], { stdio: 'inherit' })
  if (r.status !== 0) throw new Error('The client build failed (see above)')
}
