/**
 * Measured low-frequency peaks and dips explained: which room mode (or which
 * speaker-boundary cancellation) most probably made each one, how long each peak
 * rings, and — when enough peaks match axial modes — the room box that fits them.
 */
import { boundaryNotches, modePressure, modePositionClass, roomModes, speedOfSound } from '../acoustics/index'
import type { Point, RoomBox, RoomMode, Surface } from '../acoustics/index'
import { assertBand, assertCelsius, assertPointInRoom, assertPositive, assertRoom } from '../acoustics/validate'
import { butterworthBandpass, filterSos } from './bands'
import { analyzeDecay, round } from './decay'
import { findOnsetIndex } from './etc'
import { nextPow2 } from './fft'
import { decimateForLowFrequencies } from './low-frequency'
import { logFrequencies, peaksAndNulls, powerSpectrum, smoothSpectrumDb, spectrumFromPoints, type PowerSpectrum } from './spectrum'

export type LowFrequencyCause =
  | { kind: 'mode'; indices: [number, number, number]; predictedHz: number }
  | { kind: 'boundary'; surface: Surface; predictedHz: number }
  | { kind: 'unexplained' }

export interface LowFrequencyFeature {
  hz: number
  levelDb: number
  prominenceDb: number
  /** time the narrow band around the peak takes to fall 30 dB, ms; impulse responses only (null otherwise, or without 45 dB of range) */
  fall30Ms: number | null
  cause: LowFrequencyCause
}

export interface LowFrequencyDiagnosis {
  /** measured peaks of ≥ 3 dB prominence in fromHz–toHz, strongest (most prominent) first */
  peaks: LowFrequencyFeature[]
  dips: LowFrequencyFeature[]
  /** 0…1: share of the peaks with a cause other than 'unexplained' (0 when there is no peak) */
  explainedShare: number
  /** least-squares box from the peaks matched to axial modes; null with fewer than 3 such matches */
  dimensionEstimate: { length: number; width: number; height: number; matchedAxialModes: number } | null
}

/** A diagnosis as stored with a measurement's analysis: which bass source the peaks were explained for. */
export interface SourcedLowFrequencyDiagnosis extends LowFrequencyDiagnosis {
  source: 'left' | 'right' | 'subwoofer'
  sourcePoint: Point
}

export type LowFrequencyMeasurement = { samples: Float32Array | Float64Array; sampleRate: number } | { freqsHz: number[]; splDb: number[] }

export interface LowFrequencyPeakOptions {
  /** Hz, default 20 */
  fromHz?: number
  /** Hz, default 200 */
  toHz?: number
  /** air temperature stated for the room, °C (default 20) */
  celsius?: number
}

/**
 * How far a measured feature may lie from a prediction and still be explained by it (our choices, no
 * published source; they are stated so the advisor can judge a match):
 * - each stated room dimension is trusted to ±0.35 m (a tape-measured room is rarely a perfect box:
 *   linings, alcoves, a bay or chimney breast; a length misread by 30 cm must still be recognisable);
 * - the air temperature to ±5 °C (the speed of sound then moves by about ±0.9 %);
 * - the measured peak's frequency to ±1/48 octave (the 1/24-octave smoothing it is read from).
 * For a mode with indices n the dimension part is Σ wᵢ·(0.35 m / Lᵢ), wᵢ = (nᵢ/Lᵢ)² / Σ(nⱼ/Lⱼ)² —
 * the first-order change of Rayleigh's frequency with each dimension.
 * - a boundary dip may lie within ±1/6 octave of c/(4d): the other surfaces near the speaker move the
 *   combined dip (Allison, AES preprint 951, 1974), and the speaker's acoustic centre is not a point.
 * A mode counts only when it is strong at both the source and the seat: |ψ(source)·ψ(seat)| ≥ 0.1
 * (−10 dB re a pressure maximum at each, on average), by the engine's `modePressure`.
 */
export const LOW_FREQUENCY_MATCH_TOLERANCE = {
  dimensionM: 0.35,
  celsius: 5,
  peakOctaves: 1 / 48,
  boundaryOctaves: 1 / 6,
  minModePressure: 0.316,
  /** the dimension tolerance of the second pass, on the box fitted to the first pass's axial matches */
  fittedDimensionM: 0.1,
  /** an axial match further than this (relative) from the fitted box's mode is left out of the fit */
  fitOutlier: 0.025,
} as const

/** Rayleigh's frequency of mode n in a box, Hz. */
function rayleighHz(box: RoomBox, n: readonly number[], c: number): number {
  return (c / 2) * Math.hypot(n[0] / box.length, n[1] / box.width, n[2] / box.height)
}

const KIND_WEIGHT = { axial: 1, tangential: 0.5, oblique: 0.25 } as const

/** Relative frequency tolerance of a mode of the stated room (see LOW_FREQUENCY_MATCH_TOLERANCE). */
export function modeFrequencyTolerance(room: RoomBox, n: readonly [number, number, number], celsius = 20, dimensionM: number = LOW_FREQUENCY_MATCH_TOLERANCE.dimensionM): number {
  const dims = [room.length, room.width, room.height]
  const terms = n.map((v, i) => (v / dims[i]) ** 2)
  const sum = terms.reduce((a, b) => a + b, 0)
  if (sum === 0) return 0
  const dim = terms.reduce((acc, t, i) => acc + (t / sum) * (dimensionM / dims[i]), 0)
  const c = speedOfSound(celsius)
  const temp = Math.max(
    speedOfSound(celsius + LOW_FREQUENCY_MATCH_TOLERANCE.celsius) / c - 1,
    1 - speedOfSound(Math.max(-273, celsius - LOW_FREQUENCY_MATCH_TOLERANCE.celsius)) / c,
  )
  return dim + temp + (2 ** LOW_FREQUENCY_MATCH_TOLERANCE.peakOctaves - 1)
}

interface Curve {
  freqsHz: number[]
  levelsDb: number[]
  /** decimated impulse response and its onset, for the decays */
  ir: { samples: Float64Array; sampleRate: number; onset: number } | null
}

function irCurve(samples: Float32Array | Float64Array, sampleRate: number, grid: number[]): Curve {
  if (!Number.isFinite(sampleRate) || sampleRate < 8000) throw new RangeError(`sample rate must be at least 8000 Hz: got ${sampleRate}`)
  if (samples.length < 0.1 * sampleRate) throw new RangeError(`impulse response too short for a low-frequency analysis: ${samples.length} samples < 100 ms`)
  let peak = 0
  for (let i = 0; i < samples.length; i++) {
    const v = samples[i]
    if (!Number.isFinite(v)) throw new RangeError(`impulse response holds a non-finite sample (${v}) at index ${i}`)
    peak = Math.max(peak, Math.abs(v))
  }
  if (peak === 0) throw new RangeError('impulse response is all zeros: there is nothing to analyse')
  const onsetFull = findOnsetIndex(samples)
  const end = Math.min(samples.length, onsetFull + 4 * sampleRate)
  const dec = decimateForLowFrequencies(samples.subarray(0, end), sampleRate)
  const fs = dec.sampleRate
  const onset = Math.floor(onsetFull / dec.factor)
  const start = Math.max(0, onset - Math.round(0.002 * fs))
  // 1.5 s after the onset (a faded end), zero-padded to bins of at most 0.05 Hz: fine enough to place a
  // peak to a fraction of its 1/24-octave smoothing window
  const spec = powerSpectrum(dec.samples, fs, start, Math.round(1.5 * fs), { fadeFraction: 0.25, minSize: nextPow2(Math.ceil(fs / 0.05)) })
  return { freqsHz: grid, levelsDb: smoothSpectrumDb(spec, grid, 24), ir: { samples: dec.samples, sampleRate: fs, onset } }
}

function pointsCurve(freqsHz: number[], splDb: number[], grid: number[]): Curve {
  if (!Array.isArray(freqsHz) || !Array.isArray(splDb) || freqsHz.length !== splDb.length) {
    throw new RangeError('a frequency response needs freqsHz and splDb of the same length')
  }
  if (freqsHz.length < 3) throw new RangeError(`a frequency response needs at least 3 points: got ${freqsHz.length}`)
  freqsHz.forEach((f, i) => {
    assertPositive(f, `frequency [${i}]`, 'Hz')
    if (i > 0 && f <= freqsHz[i - 1]) throw new RangeError(`frequencies must ascend: ${f} Hz after ${freqsHz[i - 1]} Hz`)
    if (!Number.isFinite(splDb[i])) throw new RangeError(`level [${i}] must be a finite number of dB: got ${splDb[i]}`)
  })
  const spec: PowerSpectrum = spectrumFromPoints(freqsHz, splDb, Math.min(0.05, freqsHz[0] / 40))
  const lo = freqsHz[0]
  const hi = freqsHz[freqsHz.length - 1]
  const inside = grid.filter((f) => f >= lo && f <= hi)
  return { freqsHz: inside, levelsDb: smoothSpectrumDb(spec, inside, 24), ir: null }
}

/** Peak position refined by a parabola through the three grid points around it (log-frequency axis). */
function refine(curve: Curve, hz: number): { hz: number; levelDb: number } {
  const f = curve.freqsHz
  let i = 0
  for (let k = 1; k < f.length; k++) if (Math.abs(f[k] - hz) < Math.abs(f[i] - hz)) i = k
  if (i === 0 || i === f.length - 1) return { hz: f[i], levelDb: curve.levelsDb[i] }
  const [a, b, c] = [curve.levelsDb[i - 1], curve.levelsDb[i], curve.levelsDb[i + 1]]
  const den = a - 2 * b + c
  const p = den !== 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / den)) : 0
  const step = Math.log(f[i + 1] / f[i])
  return { hz: f[i] * Math.exp(p * step), levelDb: b - 0.25 * (a - c) * p }
}

/**
 * Time for a ±1/12-octave band around `hz` to fall 30 dB on its Schroeder decay curve, ms; null below
 * 45 dB of dynamic range (as the band decays of `lowFrequencyDecay`). Time-reversed filtering, so the
 * narrow filter's own ringing falls before the onset.
 * @see Rasmussen, Rindel & Henriksen, JAES 39(1/2), 1991 (time-reversed filtering; from memory); Schroeder, JASA 37, 1965
 */
function fall30At(ir: NonNullable<Curve['ir']>, hz: number): number | null {
  const half = 2 ** (1 / 12)
  const hiHz = Math.min(hz * half, 0.45 * ir.sampleRate)
  const sections = butterworthBandpass(hz / half, hiHz, ir.sampleRate, 2)
  const reversed = Float64Array.from(ir.samples).reverse()
  const filtered = filterSos(reversed, sections).reverse()
  const decay = analyzeDecay(filtered, ir.sampleRate, ir.onset, 4000)
  if (decay.dynamicRangeDb < 45) return null
  const { timesMs, levelsDb } = decay.curve
  const i = levelsDb.findIndex((v) => v <= -30)
  if (i < 0) return null
  if (i === 0) return timesMs[0]
  const t = (levelsDb[i - 1] + 30) / (levelsDb[i - 1] - levelsDb[i])
  return timesMs[i - 1] + t * (timesMs[i] - timesMs[i - 1])
}

interface Candidate { feature: number; score: number; cause: LowFrequencyCause }

/** Greedy one-to-one assignment: the best-scoring pair first; a prediction explains at most one feature. */
function assign(count: number, candidates: (Candidate & { key: string })[]): LowFrequencyCause[] {
  const causes: LowFrequencyCause[] = Array.from({ length: count }, () => ({ kind: 'unexplained' }))
  const usedFeature = new Set<number>()
  const usedKey = new Set<string>()
  for (const c of [...candidates].sort((a, b) => b.score - a.score)) {
    if (usedFeature.has(c.feature) || usedKey.has(c.key)) continue
    usedFeature.add(c.feature)
    usedKey.add(c.key)
    causes[c.feature] = c.cause
  }
  return causes
}

/**
 * Peaks and dips of a measured low-frequency response (an impulse response, or a frequency response
 * as points) with their prominence, the 30 dB fall time of each (impulse responses), and a cause for each:
 * - a peak: the room mode of the stated room whose Rayleigh frequency lies within the tolerance of
 *   `LOW_FREQUENCY_MATCH_TOLERANCE` and which is strong at both the source and the seat (axial modes
 *   preferred to tangential to oblique, then the nearer in frequency); else 'unexplained' — never forced;
 * - a dip: the quarter-wave boundary cancellation c/(4d) of a surface near the source within ±1/6 octave; else 'unexplained'.
 * With three or more peaks matched to axial modes, the box whose axial modes fit them best
 * (least squares per axis, f = n·c/(2L); an axis without a match keeps its stated size).
 * The curve: 1/24-octave power smoothing on a 96-per-octave grid; features of ≥ 3 dB topographic prominence.
 * @see Rayleigh's rectangular-room modes (Kuttruff, Room Acoustics, ch. 3); Allison, AES preprint 951, 1974
 */
export function explainLowFrequencyPeaks(
  measured: LowFrequencyMeasurement,
  room: RoomBox,
  source: Point,
  seat: Point,
  opts: LowFrequencyPeakOptions = {},
): LowFrequencyDiagnosis {
  assertRoom(room)
  assertPointInRoom(room, source, 'source')
  assertPointInRoom(room, seat, 'seat')
  const celsius = opts.celsius ?? 20
  assertCelsius(celsius)
  const [fromHz, toHz] = assertBand(opts.fromHz ?? 20, opts.toHz ?? 200)
  if (measured === null || typeof measured !== 'object') throw new RangeError('measured must be an impulse response { samples, sampleRate } or a frequency response { freqsHz, splDb }')

  // a margin of 1/6 octave each side, so a feature at the band's edge has neighbours for its prominence
  const grid = logFrequencies(fromHz / 2 ** (1 / 6), toHz * 2 ** (1 / 6), 96)
  const curve = 'samples' in measured ? irCurve(measured.samples, measured.sampleRate, grid) : pointsCurve(measured.freqsHz, measured.splDb, grid)
  if (curve.freqsHz.length < 5) throw new RangeError(`the frequency response does not cover ${fromHz}–${toHz} Hz`)
  const found = peaksAndNulls(curve.freqsHz, curve.levelsDb, { minProminenceDb: 3 })
  const within = (e: { hz: number }) => e.hz >= fromHz && e.hz <= toHz
  const byProminence = <T extends { prominenceDb: number }>(a: T, b: T) => b.prominenceDb - a.prominenceDb
  const peaksRaw = found.peaks.map((p) => ({ ...p, ...refine(curve, p.hz) })).filter(within).sort(byProminence)
  const dipsRaw = found.nulls
    .map((p) => {
      const r = refine({ ...curve, levelsDb: curve.levelsDb.map((v) => -v) }, p.hz)
      return { ...p, hz: r.hz, levelDb: -r.levelDb }
    })
    .filter(within)
    .sort(byProminence)

  // peaks → modes: a first pass on the stated room; when its axial matches fit a box, a second pass on
  // that box with the dimension tolerance narrowed (a consistent offset such as a misread length then
  // no longer blurs the other matches). predictedHz always names the stated room's frequency.
  const modes = roomModes(room, { maxHz: toHz * 1.6, celsius }).map((m) => ({
    m,
    strength: Math.abs(modePressure(room, m, source) * modePressure(room, m, seat)),
  })).filter((e) => e.strength >= LOW_FREQUENCY_MATCH_TOLERANCE.minModePressure ** 2)
  const c = speedOfSound(celsius)
  const peakHz = peaksRaw.map((p) => p.hz)
  const matchModes = (box: RoomBox, dimensionM: number): LowFrequencyCause[] => {
    const candidates: (Candidate & { key: string })[] = []
    for (const e of modes) {
      const hz = rayleighHz(box, e.m.n, c)
      const tol = modeFrequencyTolerance(box, e.m.n, celsius, dimensionM)
      peakHz.forEach((f, i) => {
        const d = Math.abs(f - hz) / (tol * hz)
        if (d > 1) return
        candidates.push({
          feature: i,
          key: e.m.n.join('-'),
          score: KIND_WEIGHT[e.m.kind] * e.strength * (1 - d) ** 2,
          cause: { kind: 'mode', indices: [...e.m.n] as [number, number, number], predictedHz: round(e.m.hz, 2) },
        })
      })
    }
    return assign(peakHz.length, candidates)
  }
  let peakCauses = matchModes(room, LOW_FREQUENCY_MATCH_TOLERANCE.dimensionM)
  let dimensionEstimate = fitBox(room, peakHz, peakCauses, c)
  if (dimensionEstimate) {
    const second = matchModes(dimensionEstimate, LOW_FREQUENCY_MATCH_TOLERANCE.fittedDimensionM)
    const refit = fitBox(room, peakHz, second, c)
    if (refit) { peakCauses = second; dimensionEstimate = refit }
  }

  // dips → boundary cancellations
  const ratio = 2 ** LOW_FREQUENCY_MATCH_TOLERANCE.boundaryOctaves
  const notches = boundaryNotches(room, source, { celsius }).filter((n) => Number.isFinite(n.notchHz))
  const dipCandidates: (Candidate & { key: string })[] = []
  dipsRaw.forEach((p, i) => {
    for (const n of notches) {
      const r = p.hz / n.notchHz
      if (r > ratio || r < 1 / ratio) continue
      dipCandidates.push({
        feature: i,
        key: n.surface,
        score: 1 - Math.abs(Math.log(r)) / Math.log(ratio),
        cause: { kind: 'boundary', surface: n.surface, predictedHz: round(n.notchHz, 2) },
      })
    }
  })
  const dipCauses = assign(dipsRaw.length, dipCandidates)

  const feature = (p: { hz: number; levelDb: number; prominenceDb: number }, cause: LowFrequencyCause, withDecay: boolean): LowFrequencyFeature => {
    const fall = withDecay && curve.ir ? fall30At(curve.ir, p.hz) : null
    return { hz: round(p.hz, 2), levelDb: round(p.levelDb, 2), prominenceDb: round(p.prominenceDb, 2), fall30Ms: fall === null ? null : round(fall, 1), cause }
  }
  const peaks = peaksRaw.map((p, i) => feature(p, peakCauses[i], true))
  const dips = dipsRaw.map((p, i) => feature(p, dipCauses[i], false))
  const explained = peaks.filter((p) => p.cause.kind !== 'unexplained').length

  return {
    peaks,
    dips,
    explainedShare: peaks.length ? explained / peaks.length : 0,
    dimensionEstimate,
  }
}

/**
 * Least squares per axis on the relative error: minimise Σ (1 − n_k·c/(2L·f_k))² over 1/L, giving
 * 1/L = (2/c)·Σ(n_k/f_k) / Σ(n_k/f_k)². While a match lies further than `fitOutlier` from the fitted
 * box, the worst (residual × mode order) is left out and the fit repeated; null with fewer than 3 left.
 */
function fitBox(room: RoomBox, hz: number[], causes: LowFrequencyCause[], c: number): LowFrequencyDiagnosis['dimensionEstimate'] {
  let matches = causes.flatMap((cause, k) => {
    if (cause.kind !== 'mode' || cause.indices.filter((v) => v > 0).length !== 1) return []
    const axis = cause.indices.findIndex((v) => v > 0)
    return [{ axis, n: cause.indices[axis], f: hz[k] }]
  })
  const stated = [room.length, room.width, room.height]
  for (;;) {
    if (matches.length < 3) return null
    const fit = [0, 1, 2].map((axis) => {
      const on = matches.filter((m) => m.axis === axis)
      if (!on.length) return stated[axis]
      const a = on.reduce((s, m) => s + m.n / m.f, 0)
      const b = on.reduce((s, m) => s + (m.n / m.f) ** 2, 0)
      return (c * b) / (2 * a)
    })
    const residual = (m: (typeof matches)[number]) => Math.abs(1 - (m.n * c) / (2 * fit[m.axis] * m.f))
    // the worst by residual × order: of two matches that disagree, the higher-order one (where modes lie
    // closer together and a neighbour more easily takes the peak) goes first
    const worst = matches.reduce((w, m) => (residual(m) * m.n > residual(w) * w.n ? m : w))
    if (matches.some((m) => residual(m) > LOW_FREQUENCY_MATCH_TOLERANCE.fitOutlier)) {
      matches = matches.filter((m) => m !== worst)
      continue
    }
    return { length: round(fit[0], 3), width: round(fit[1], 3), height: round(fit[2], 3), matchedAxialModes: matches.length }
  }
}

/** A label such as "43 Hz: length mode 1-0-0, 11 dB, 610 ms". */
export function describeLowFrequencyFeature(f: LowFrequencyFeature): string {
  const head = `${Math.round(f.hz)} Hz: `
  const tail = `, ${Math.round(f.prominenceDb)} dB${f.fall30Ms !== null ? `, ${Math.round(f.fall30Ms)} ms` : ''}`
  const c = f.cause
  if (c.kind === 'mode') return head + `${modeName(c.indices)} ${c.indices.join('-')}` + tail
  if (c.kind === 'boundary') return head + `${c.surface} boundary dip` + tail
  return head + 'unexplained' + tail
}

/** "length mode", "width mode", "height mode" for axial modes; "tangential mode", "oblique mode" otherwise. */
export function modeName(n: readonly [number, number, number]): string {
  const nonZero = n.filter((v) => v > 0).length
  if (nonZero === 1) return `${['length', 'width', 'height'][n.findIndex((v) => v > 0)]} mode`
  return nonZero === 2 ? 'tangential mode' : 'oblique mode'
}

export type { RoomMode }
