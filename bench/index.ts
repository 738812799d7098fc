/**
 * `npm run bench`: runs every benchmark script and prints one table of figures at the end.
 * Each script exports `run(): Promise<Figure[]>`; timing is reported here, never asserted in tests.
 */
import { spawn } from 'node:child_process'
import { cpus } from 'node:os'
import { fileURLToPath } from 'node:url'

export interface Figure { name: string; value: number; unit: string; target?: string }

// Bulk loads of 10 000 cases take longer than a request may.
process.env.DB_STATEMENT_TIMEOUT_MS ??= '300000'

const all = ['./engine', './engine-worst', './signal', './lowfreq', './queue', './queue-metrics', './sockets', './load', './pages']
// BENCH_ONLY=queue,sockets runs a part of the bench (names as in the list above), e.g. while iterating.
const only = process.env.BENCH_ONLY?.split(',').map((x) => `./${x.trim()}`)
const scripts = only ? all.filter((s) => only.includes(s)) : all

const MARK = 'BENCH_FIGURES '
// A child process runs one part and hands its figures back on one stdout line.
if (process.env.BENCH_PART) {
  const mod = (await import(process.env.BENCH_PART)) as { run?: () => Promise<Figure[]> }
  const figures = mod.run ? await mod.run() : []
  process.stdout.write(`\n${MARK}${JSON.stringify(figures.map((f) => ({ ...f, value: Number.isFinite(f.value) ? f.value : null })))}\n`)
  process.exit(0)
}

/**
 * Each part runs in a process of its own (its own heap, event loop and throwaway database), so one
 * part's seeded rows, caches and garbage do not weigh on the next part's figures.
 */
function runPart(s: string): Promise<Figure[]> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url)], {
      env: { ...process.env, BENCH_PART: s }, stdio: ['ignore', 'pipe', 'inherit'],
    })
    let out = ''
    child.stdout.on('data', (d: Buffer) => { out += d.toString() })
    child.on('error', reject)
    child.on('exit', (code) => {
      const line = out.split('\n').find((l) => l.startsWith(MARK))
      if (!line) return reject(new Error(`exit ${code}, no figures`))
      resolve((JSON.parse(line.slice(MARK.length)) as Figure[]).map((f) => ({ ...f, value: f.value ?? NaN })))
    })
  })
}

const rows: (Figure & { script: string })[] = []
for (const s of scripts) {
  try {
    console.error(`[bench] ${s} …`)
    for (const f of await runPart(s)) rows.push({ ...f, script: s.slice(2) })
  } catch (e) {
    console.error(`[bench] ${s} failed:`, e)
    rows.push({ script: s.slice(2), name: 'failed', value: NaN, unit: String((e as Error).message ?? e).slice(0, 60) })
  }
}

const cpu = cpus()[0]?.model ?? 'unknown CPU'
console.log(`\nRoomwright benchmark — ${new Date().toISOString().slice(0, 10)}, Node ${process.version}, ${cpus().length} × ${cpu}\n`)
const w = Math.max(...rows.map((r) => `${r.script}: ${r.name}`.length), 20)
console.log(`${'figure'.padEnd(w)}  ${'value'.padStart(12)}  unit      target`)
console.log(`${'-'.repeat(w)}  ${'-'.repeat(12)}  --------  ------`)
for (const r of rows) {
  const v = Number.isFinite(r.value) ? (Math.abs(r.value) >= 100 ? r.value.toFixed(0) : r.value.toFixed(2)) : '—'
  console.log(`${`${r.script}: ${r.name}`.padEnd(w)}  ${v.padStart(12)}  ${r.unit.padEnd(8)}  ${r.target ?? ''}`)
}
// The ratios again, as lines of their own under the table, each beside the absolute figures it divides.
const ratios = rows.filter((r) => r.name.startsWith('RATIO '))
if (ratios.length) {
  console.log('\nRatios (throughput against the bare Express JSON route, same load settings, same run)')
  const abs = (prefix: string) => rows.filter((r) => r.script === 'queue' && r.name.startsWith(prefix) && (r.unit === 'req/s' || r.name.includes('p95'))).map((r) => `${r.unit === 'ms' ? 'p95' : 'rps'} ${r.value.toFixed(0)}`).join(', ')
  const of: Record<string, string> = { 'queue first page': 'queue first page', 'queue search': 'queue search', 'signed-in /api/auth/me': 'signed-in /api/auth/me' }
  for (const r of ratios) {
    const what = r.name.slice(6).replace(' / bare route', '')
    console.log(`  ${what} / bare: ${r.value.toFixed(1)} %${r.target ? ` (target ${r.target})` : ''} — ${abs(of[what] ?? what)}; bare ${abs('bare Express JSON route throughput')}`)
  }
}
process.exit(0)
