/**
 * The storage sweep: what a crash mid-upload leaves behind is removed once it is older than a grace
 * period (longer than any upload takes): write leftovers in `.tmp/`, uploads never finalised in
 * `incoming/`, and files under `cases/` that no file row names (moved into place, then the process
 * died before the row was committed). Runs at start and every SWEEP_INTERVAL_MS on nodes that run jobs.
 * Local disk only; an S3 bucket is swept by a lifecycle rule on the `incoming/` prefix (SECURITY.md).
 */
import { readdir, rm, stat } from 'node:fs/promises'
import path from 'node:path'
import { Op } from 'sequelize'
import { models } from '../db/models'
import { log } from '../lib/log'
import { storage } from './index'
import { LocalStorage } from './local'

/** Anything younger is left alone: an upload may still be on its way (ms). */
export const SWEEP_GRACE_MS = 60 * 60_000
export const SWEEP_INTERVAL_MS = 60 * 60_000

async function* filesUnder(dir: string): AsyncGenerator<string> {
  for (const entry of await readdir(dir, { withFileTypes: true }).catch(() => [])) {
    const full = path.join(dir, entry.name)
    if (entry.isDirectory()) yield* filesUnder(full)
    else if (entry.isFile()) yield full
  }
}

async function oldEnough(file: string, now: number, graceMs: number): Promise<boolean> {
  const info = await stat(file).catch(() => undefined)
  return !!info && now - info.mtimeMs > graceMs
}

export interface SweepResult { temp: number; incoming: number; orphans: number }

export async function sweepStorage(opts: { graceMs?: number; store?: LocalStorage } = {}): Promise<SweepResult> {
  const store = opts.store ?? storage()
  const result: SweepResult = { temp: 0, incoming: 0, orphans: 0 }
  if (!(store instanceof LocalStorage)) return result
  const graceMs = opts.graceMs ?? SWEEP_GRACE_MS
  const now = Date.now()
  result.temp = await store.sweepTemp(graceMs)
  for await (const file of filesUnder(path.join(store.root, 'incoming'))) {
    if (await oldEnough(file, now, graceMs)) { await rm(file, { force: true }); result.incoming++ }
  }
  const candidates: { file: string; key: string }[] = []
  for await (const file of filesUnder(path.join(store.root, 'cases'))) {
    if (await oldEnough(file, now, graceMs)) candidates.push({ file, key: path.relative(store.root, file).split(path.sep).join('/') })
  }
  for (let i = 0; i < candidates.length; i += 500) {
    const batch = candidates.slice(i, i + 500)
    const keys = batch.map((c) => c.key)
    const rows = await models().File.findAll({ attributes: ['storageKey', 'thumbKey'], where: { [Op.or]: [{ storageKey: keys }, { thumbKey: keys }] } })
    const known = new Set(rows.flatMap((r) => [r.storageKey, r.thumbKey]))
    for (const c of batch) if (!known.has(c.key)) { await rm(c.file, { force: true }); result.orphans++ }
  }
  if (result.temp || result.incoming || result.orphans) log.info('storage sweep removed leftovers', { ...result })
  return result
}

/** Sweeps now and then every SWEEP_INTERVAL_MS; returns the stop function. */
export function startStorageSweep(): () => Promise<void> {
  const run = () => sweepStorage().catch((err) => log.warn('storage sweep failed', { err: String(err) }))
  void run()
  const timer = setInterval(run, SWEEP_INTERVAL_MS)
  timer.unref()
  return async () => clearInterval(timer)
}
