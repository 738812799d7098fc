/**
 * Subwoofer layouts for several seats: where one, two or four subwoofers should stand (and at what
 * relative level) so that the bass is alike at every seat, by the engine's modal model.
 */
import type { ModalResponseOptions, ModalSystem } from './modes'
import { buildModalSystem, smoothPower, sourceWeights, spreadDbOfPower, transferFromWeights } from './modes'
import type { Point, RoomBox } from './types'
import { assertBand, assertFinite, assertPointInRoom, assertPositive, assertRoom } from './validate'

export interface SubwooferSearchOptions extends ModalResponseOptions {
  /** layouts to search, subwoofers in each (default [1, 2, 4]) */
  counts?: number[]
  /** where a subwoofer may stand (default: a grid along the walls 0.3 m above the floor, corners and wall midpoints included) */
  candidates?: Point[]
  /** band for the figures, Hz (default 20–120) */
  fromHz?: number
  toHz?: number
  // additions beside the contract
  /** the room's own subwoofers, evaluated as `current` */
  current?: Point[]
  /** their relative levels, dB (default all 0) */
  currentGainsDb?: number[]
  /** relative levels a subwoofer may be given, dB, 0 first (default [0, −3, −6, −10]) */
  gainStepsDb?: number[]
  /** greatest spacing of the default candidate grid along a wall, metres (default 0.75) */
  candidateSpacing?: number
  /** height of the default candidates, metres (default 0.3) */
  candidateHeight?: number
  /** every position set × every level set is tried while their product stays within this (default 60 000); beyond it, see `searchSubwoofers` */
  exhaustiveLimit?: number
  /** position sets whose levels are refined when the search is not exhaustive (default 24) */
  refineTop?: number
}

export interface SubwooferLayout {
  /** one per subwoofer */
  positions: Point[]
  /** relative drive level per subwoofer, 0 for the loudest; all in phase */
  gainsDb: number[]
  /** mean over the band's frequency points of the standard deviation, across the seats, of the level in dB (Welti & Devantier, JAES 2006) */
  seatToSeatDb: number
  /** mean over the seats of the peak-to-null spread in the band, dB */
  meanSpreadDb: number
}

export interface SubwooferSearch {
  /** the room's own subwoofers, when it has any */
  current: SubwooferLayout | null
  /** one per searched count, in the order of `counts` */
  best: { count: number; layout: SubwooferLayout }[]
}

export interface SubwooferLayoutResponse {
  freqsHz: number[]
  /** per seat: the level (unsmoothed and smoothed as the spread) in dB re the mean power over every seat and frequency, and the spread */
  seats: { levelDb: number[]; smoothedDb: number[]; spreadDb: number }[]
  seatToSeatDb: number
  meanSpreadDb: number
  bandHz: [number, number]
}

/** Levels more than 60 dB below the layout's mean power are taken as −60 dB (no room is that quiet at a null next to its noise); our choice. */
const FLOOR_DB = -60

/**
 * The default candidates: along each wall, 0.3 m above the floor (at most the room's height), at even
 * steps of at most `spacing` metres with an even number of steps, so both corners and the wall's
 * midpoint are among them; the walls' shared corners once each. Points lie on the wall planes (the
 * model's point source; a box against the wall differs little below 120 Hz, where λ ≥ 2.9 m).
 */
export function subwooferCandidates(room: RoomBox, opts: { spacing?: number; height?: number } = {}): Point[] {
  assertRoom(room)
  const spacing = opts.spacing ?? 0.75
  assertPositive(spacing, 'candidateSpacing', 'm')
  const z = Math.min(opts.height ?? 0.3, room.height)
  assertFinite(z, 'candidateHeight')
  const steps = (len: number) => 2 * Math.max(1, Math.ceil(len / spacing / 2))
  const out: Point[] = []
  const seen = new Set<string>()
  const add = (x: number, y: number) => {
    const key = `${x.toFixed(6)},${y.toFixed(6)}`
    if (seen.has(key)) return
    seen.add(key)
    out.push({ x, y, z })
  }
  const nx = steps(room.length)
  const ny = steps(room.width)
  // the last step lands exactly on the far wall (len·n/n can round past it)
  const at = (len: number, i: number, n: number) => (i === n ? len : (len * i) / n)
  for (let i = 0; i <= ny; i++) add(0, at(room.width, i, ny)) // front wall
  for (let i = 0; i <= ny; i++) add(room.length, at(room.width, i, ny)) // back wall
  for (let i = 0; i <= nx; i++) add(at(room.length, i, nx), 0) // left wall
  for (let i = 0; i <= nx; i++) add(at(room.length, i, nx), room.width) // right wall
  return out
}

/** @internal Complex transfer from each candidate to each seat on the system's grid. */
interface Transfers {
  sys: ModalSystem
  F: number
  S: number
  /** [c][s] → Float64Array(2F): re, im interleaved */
  t: Float64Array[][]
}

function transfers(sys: ModalSystem, candidates: readonly Point[], seats: readonly Point[]): Transfers {
  const F = sys.freqsHz.length
  const M = sys.modeCount
  const seatW = seats.map((s) => sourceWeights(sys, [s]))
  const total = M + sys.farCount
  const w = new Float64Array(total)
  const re = new Float64Array(F)
  const im = new Float64Array(F)
  // the engine's sum: the exactly summed modes, then the far modes through their series
  const t = candidates.map((c) => {
    const cw = sourceWeights(sys, [c])
    return seatW.map((sw) => {
      for (let m = 0; m < total; m++) w[m] = cw[m] * sw[m]
      transferFromWeights(sys, w, re, im)
      const out = new Float64Array(2 * F)
      for (let f = 0; f < F; f++) { out[2 * f] = re[f]; out[2 * f + 1] = im[f] }
      return out
    })
  })
  return { sys, F, S: seats.length, t }
}

interface Scratch { power: Float64Array[]; prefix: Float64Array; db: Float64Array }

function scratch(tr: Transfers): Scratch {
  return { power: Array.from({ length: tr.S }, () => new Float64Array(tr.F)), prefix: new Float64Array(tr.F + 1), db: new Float64Array(tr.S * tr.F) }
}

/** Power per seat from summed complex transfers `sum[s]` (2F each) into `sc.power`; returns the level floor, FLOOR_DB under their mean. */
function seatPowers(tr: Transfers, sum: Float64Array[], sc: Scratch): number {
  const { F, S } = tr
  let mean = 0
  for (let s = 0; s < S; s++) {
    const p = sc.power[s]
    const x = sum[s]
    for (let f = 0; f < F; f++) {
      const v = x[2 * f] * x[2 * f] + x[2 * f + 1] * x[2 * f + 1]
      p[f] = v
      mean += v
    }
  }
  mean /= S * F
  return mean * 10 ** (FLOOR_DB / 10)
}

/** The layout's figures from summed complex transfers `sum[s]` (2F each). */
function figures(tr: Transfers, sum: Float64Array[], sc: Scratch): { seatToSeatDb: number; meanSpreadDb: number } {
  const { F, S } = tr
  const floor = seatPowers(tr, sum, sc)
  let spread = 0
  for (let s = 0; s < S; s++) {
    const p = sc.power[s]
    for (let f = 0; f < F; f++) sc.db[s * F + f] = DB_PER_NEPER_POWER * Math.log(Math.max(p[f], floor))
    spread += spreadDbOfPower(tr.sys, p, sc.prefix)
  }
  let std = 0
  if (S > 1) {
    for (let f = 0; f < F; f++) {
      let a = 0
      let b = 0
      for (let s = 0; s < S; s++) { const v = sc.db[s * F + f]; a += v; b += v * v }
      const m = a / S
      std += Math.sqrt(Math.max(0, b / S - m * m))
    }
    std /= F
  }
  return { seatToSeatDb: std, meanSpreadDb: spread / S }
}

const DB_PER_NEPER_POWER = 10 / Math.LN10

/**
 * The seat-to-seat figure alone, abandoned (Infinity) once its running sum shows it cannot come within
 * `bound`: the search's inner loop, equal to `figures(...).seatToSeatDb` whenever it returns a number.
 */
function seatToSeatBounded(tr: Transfers, sum: Float64Array[], sc: Scratch, bound: number): number {
  const { F, S } = tr
  if (S < 2) return 0
  const floor = seatPowers(tr, sum, sc)
  const limit = bound * F
  let std = 0
  for (let f = 0; f < F; f++) {
    let a = 0
    let b = 0
    for (let s = 0; s < S; s++) {
      const v = DB_PER_NEPER_POWER * Math.log(Math.max(sc.power[s][f], floor))
      a += v
      b += v * v
    }
    const m = a / S
    std += Math.sqrt(Math.max(0, b / S - m * m))
    if (std > limit) return Infinity
  }
  return std / F
}

function sumOf(tr: Transfers, idx: readonly number[], gains: readonly number[]): Float64Array[] {
  return Array.from({ length: tr.S }, (_, s) => {
    const out = new Float64Array(2 * tr.F)
    idx.forEach((c, i) => {
      const g = gains[i]
      const x = tr.t[c][s]
      for (let k = 0; k < out.length; k++) out[k] += g * x[k]
    })
    return out
  })
}

const amp = (db: number) => 10 ** (db / 20)
const TIE_DB = 1e-9
const better = (a: { seatToSeatDb: number; meanSpreadDb: number }, b: { seatToSeatDb: number; meanSpreadDb: number }) =>
  a.seatToSeatDb < b.seatToSeatDb - TIE_DB || (Math.abs(a.seatToSeatDb - b.seatToSeatDb) <= TIE_DB && a.meanSpreadDb < b.meanSpreadDb - TIE_DB)

/** Every way to give k subwoofers levels from the steps with at least one at 0 dB (the loudest). */
function gainSets(k: number, steps: readonly number[]): number[][] {
  const out: number[][] = []
  const rec = (prefix: number[]) => {
    if (prefix.length === k) { if (prefix.some((g) => g === 0)) out.push(prefix); return }
    for (const g of steps) rec([...prefix, g])
  }
  rec([])
  return out
}

function binomial(n: number, k: number): number {
  let r = 1
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i
  return Math.round(r)
}

function checkOptions(room: RoomBox, seats: readonly Point[], opts: SubwooferSearchOptions) {
  assertRoom(room)
  if (!Array.isArray(seats) || seats.length === 0) throw new RangeError('the subwoofer search needs at least one seat')
  seats.forEach((s, i) => assertPointInRoom(room, s, `seat ${i + 1}`))
  const [fromHz, toHz] = assertBand(opts.fromHz ?? 20, opts.toHz ?? 120)
  return { fromHz, toHz }
}

function systemFor(room: RoomBox, opts: SubwooferSearchOptions, fromHz: number, toHz: number): ModalSystem {
  return buildModalSystem(room, {
    rt60: opts.rt60, celsius: opts.celsius, pointsPerOctave: opts.pointsPerOctave, modalMaxHz: opts.modalMaxHz,
    smoothingOctaves: opts.smoothingOctaves, fromHz, toHz, spreadFromHz: fromHz, spreadToHz: toHz,
  })
}

function checkGains(gainsDb: readonly number[], count: number, what: string): void {
  if (!Array.isArray(gainsDb) || gainsDb.length !== count) throw new RangeError(`${what} needs one level per subwoofer (${count}): got ${Array.isArray(gainsDb) ? gainsDb.length : String(gainsDb)}`)
  gainsDb.forEach((g, i) => {
    assertFinite(g, `${what} [${i}]`)
    if (g > 0) throw new RangeError(`${what} [${i}] must be 0 dB or below (0 for the loudest): got ${g}`)
  })
}

/**
 * Search layouts of 1, 2 and 4 subwoofers (or `counts`) over candidate positions for the smallest
 * seat-to-seat variation across `seats`, then the smallest mean peak-to-null spread, by the engine's
 * modal model (`buildModalSystem`, as `modalResponse`: the same modes, damping and 1/6-octave spread).
 * The subwoofers play in phase; each may be turned down by one of `gainStepsDb`. While the number of
 * position sets × level sets stays within `exhaustiveLimit` every one is tried; beyond that every
 * position set is tried at equal levels and the levels of the `refineTop` best are refined by
 * coordinate descent (each subwoofer in turn tries every step, until no change improves the figures).
 * @param seats every seat to equalise, metres
 * @see Welti & Devantier, "Low-frequency optimization using multiple subwoofers", JAES 54(5), 2006 (seat-to-seat variation)
 */
export function searchSubwoofers(room: RoomBox, seats: Point[], opts: SubwooferSearchOptions = {}): SubwooferSearch {
  const { fromHz, toHz } = checkOptions(room, seats, opts)
  const candidates = opts.candidates ?? subwooferCandidates(room, { spacing: opts.candidateSpacing, height: opts.candidateHeight })
  if (!Array.isArray(candidates) || candidates.length === 0) throw new RangeError('the subwoofer search needs at least one candidate position')
  candidates.forEach((c, i) => assertPointInRoom(room, c, `candidate ${i + 1}`))
  const counts = opts.counts ?? [1, 2, 4]
  if (!Array.isArray(counts) || counts.length === 0) throw new RangeError('counts must list at least one number of subwoofers')
  counts.forEach((k, i) => {
    if (!Number.isInteger(k) || k < 1 || k > 8) throw new RangeError(`counts [${i}] must be a whole number of subwoofers from 1 to 8: got ${k}`)
    if (k > candidates.length) throw new RangeError(`counts [${i}] = ${k} exceeds the ${candidates.length} candidate positions`)
  })
  const steps = opts.gainStepsDb ?? [0, -3, -6, -10]
  if (!Array.isArray(steps) || !steps.includes(0)) throw new RangeError('gainStepsDb must include 0 dB')
  steps.forEach((g, i) => { assertFinite(g, `gainStepsDb [${i}]`); if (g > 0) throw new RangeError(`gainStepsDb [${i}] must be 0 dB or below: got ${g}`) })
  const limit = opts.exhaustiveLimit ?? 60_000
  const refineTop = opts.refineTop ?? 24

  const sys = systemFor(room, opts, fromHz, toHz)
  const tr = transfers(sys, candidates, seats)
  const sc = scratch(tr)
  const C = candidates.length
  const layout = (idx: readonly number[], gainsDb: readonly number[], fig: { seatToSeatDb: number; meanSpreadDb: number }): SubwooferLayout => ({
    positions: idx.map((i) => ({ ...candidates[i] })),
    gainsDb: [...gainsDb],
    seatToSeatDb: fig.seatToSeatDb,
    meanSpreadDb: fig.meanSpreadDb,
  })

  const best = counts.map((k) => {
    const sets = gainSets(k, steps)
    const exhaustive = binomial(C, k) * sets.length <= limit
    const trySets = exhaustive ? sets.map((g) => g.map(amp)) : [new Array(k).fill(1)]
    // every position set (k of C, ascending indices), partial sums carried down the recursion
    type Entry = { idx: number[]; gains: number[]; fig: { seatToSeatDb: number; meanSpreadDb: number } }
    let top: Entry[] = []
    const keep = exhaustive ? 1 : Math.max(1, refineTop)
    const consider = (e: Entry) => {
      if (top.length < keep) { top.push(e); top.sort((a, b) => (better(a.fig, b.fig) ? -1 : better(b.fig, a.fig) ? 1 : 0)); return }
      if (!better(e.fig, top[top.length - 1].fig)) return
      top[top.length - 1] = e
      top.sort((a, b) => (better(a.fig, b.fig) ? -1 : better(b.fig, a.fig) ? 1 : 0))
    }
    const idx: number[] = []
    const partial = Array.from({ length: k + 1 }, () => Array.from({ length: tr.S }, () => new Float64Array(2 * tr.F)))
    const rec = (start: number) => {
      const d = idx.length
      if (d === k) {
        for (let gi = 0; gi < trySets.length; gi++) {
          const g = trySets[gi]
          const sum = exhaustive ? sumOf(tr, idx, g) : partial[k]
          const full = top.length < keep
          const bound = full ? Infinity : top[top.length - 1].fig.seatToSeatDb + 2 * TIE_DB
          if (seatToSeatBounded(tr, sum, sc, bound) === Infinity) continue
          const fig = figures(tr, sum, sc)
          if (full || better(fig, top[top.length - 1].fig)) {
            consider({ idx: [...idx], gains: exhaustive ? sets[gi] : new Array(k).fill(0), fig })
          }
        }
        return
      }
      for (let c = start; c <= C - (k - d); c++) {
        idx.push(c)
        if (!exhaustive) {
          for (let s = 0; s < tr.S; s++) {
            const a = partial[d][s]
            const b = tr.t[c][s]
            const out = partial[d + 1][s]
            for (let q = 0; q < out.length; q++) out[q] = a[q] + b[q]
          }
        }
        rec(c + 1)
        idx.pop()
      }
    }
    rec(0)
    if (!exhaustive && k > 1) {
      top = top.map((e) => {
        let gains = [...e.gains]
        let fig = e.fig
        for (let pass = 0; pass < 8; pass++) {
          let changed = false
          for (let i = 0; i < k; i++) {
            for (const g of steps) {
              if (g === gains[i]) continue
              const trial = [...gains]
              trial[i] = g
              const loudest = Math.max(...trial)
              const norm = trial.map((v) => v - loudest)
              const f = figures(tr, sumOf(tr, e.idx, norm.map(amp)), sc)
              if (better(f, fig)) { gains = norm; fig = f; changed = true }
            }
          }
          if (!changed) break
        }
        return { ...e, gains, fig }
      })
      top.sort((a, b) => (better(a.fig, b.fig) ? -1 : better(b.fig, a.fig) ? 1 : 0))
    }
    const e = top[0]
    return { count: k, layout: layout(e.idx, e.gains, e.fig) }
  })

  let current: SubwooferLayout | null = null
  if (opts.current && opts.current.length) {
    opts.current.forEach((p, i) => assertPointInRoom(room, p, `subwoofer ${i + 1}`))
    const gainsDb = opts.currentGainsDb ?? opts.current.map(() => 0)
    checkGains(gainsDb, opts.current.length, 'currentGainsDb')
    const r = layoutFigures(sys, opts.current, gainsDb, seats)
    current = { positions: opts.current.map((p) => ({ ...p })), gainsDb: [...gainsDb], seatToSeatDb: r.seatToSeatDb, meanSpreadDb: r.meanSpreadDb }
  }
  return { current, best }
}

function layoutFigures(sys: ModalSystem, positions: readonly Point[], gainsDb: readonly number[], seats: readonly Point[]) {
  const tr = transfers(sys, positions, seats)
  const sc = scratch(tr)
  const sum = sumOf(tr, positions.map((_, i) => i), gainsDb.map(amp))
  return { tr, sc, sum, ...figures(tr, sum, sc) }
}

/**
 * The predicted low-frequency response at each seat for a subwoofer layout, with the figures a layout
 * of `searchSubwoofers` reports (the same evaluation): levels in dB re the mean power over every seat
 * and frequency, smoothed as the spread (1/6 octave by default).
 */
export function subwooferLayoutResponse(
  room: RoomBox, seats: Point[], layout: { positions: Point[]; gainsDb?: number[] }, opts: SubwooferSearchOptions = {},
): SubwooferLayoutResponse {
  const { fromHz, toHz } = checkOptions(room, seats, opts)
  if (!layout || !Array.isArray(layout.positions) || layout.positions.length === 0) throw new RangeError('the layout needs at least one subwoofer position')
  layout.positions.forEach((p, i) => assertPointInRoom(room, p, `subwoofer ${i + 1}`))
  const gainsDb = layout.gainsDb ?? layout.positions.map(() => 0)
  checkGains(gainsDb, layout.positions.length, 'gainsDb')
  const sys = systemFor(room, opts, fromHz, toHz)
  const r = layoutFigures(sys, layout.positions, gainsDb, seats)
  const F = r.tr.F
  let mean = 0
  r.sc.power.forEach((p) => p.forEach((v) => { mean += v }))
  mean = mean / (F * seats.length) || Number.MIN_VALUE
  const floor = mean * 10 ** (FLOOR_DB / 10)
  const seatsOut = r.sc.power.map((p) => {
    const levelDb: number[] = []
    const smoothedDb: number[] = []
    const smooth = smoothPower(sys, p)
    for (let f = 0; f < F; f++) {
      levelDb.push(10 * Math.log10(Math.max(p[f], floor) / mean))
      smoothedDb.push(10 * Math.log10(Math.max(smooth[f], floor) / mean))
    }
    return { levelDb, smoothedDb, spreadDb: spreadDbOfPower(sys, p, new Float64Array(F + 1)) }
  })
  return { freqsHz: Array.from(sys.freqsHz), seats: seatsOut, seatToSeatDb: r.seatToSeatDb, meanSpreadDb: r.meanSpreadDb, bandHz: [fromHz, toHz] }
}
