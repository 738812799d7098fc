/**
 * `npm run bench`: runs every benchmark script and prints one table of figures at the end.
 * Each script exports `run(): Promise<Figure[]>`; timing is reported here, never asserted in tests.
 */
import { cpus } from 'node:os'

export interface Figure { name: string; value: number; unit: string; target?: string }

// Bulk loads of 10 000 cases take longer than a request may.
process.env.DB_STATEMENT_TIMEOUT_MS ??= '300000'

const scripts = ['./engine', './engine-worst', './signal', './queue', './queue-metrics', './sockets', './load']

const rows: (Figure & { script: string })[] = []
for (const s of scripts) {
  try {
    const mod = (await import(s)) as { run?: () => Promise<Figure[]> }
    if (!mod.run) continue
    console.error(`[bench] ${s} …`)
    for (const f of await mod.run()) rows.push({ ...f, script: s.slice(2) })
  } catch (e) {
    if ((e as { code?: string }).code === 'ERR_MODULE_NOT_FOUND' && String(e).includes(s.slice(2))) continue
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
process.exit(0)
