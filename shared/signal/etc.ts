/**
 * Direct sound, energy-time curve and early reflections of an impulse response.
 */
import { analyticEnergy } from './fft'
import { round } from './decay'

/**
 * Onset of the impulse response: the first sample whose square comes within 20 dB
 * of the largest square.
 * @see ISO 3382-1:2009 Annex A.3.4 (start of the impulse response)
 */
export function findOnsetIndex(samples: ArrayLike<number>): number {
  let peak = 0
  for (let i = 0; i < samples.length; i++) peak = Math.max(peak, samples[i] * samples[i])
  const threshold = peak / 100
  for (let i = 0; i < samples.length; i++) if (samples[i] * samples[i] >= threshold) return i
  return 0
}

export interface EnergyTimeCurve {
  /** direct-sound arrival from the file's start, ms (peak of the envelope, interpolated) */
  directSoundMs: number
  /** first sample of the curve in the file */
  startIndex: number
  sampleRate: number
  /** 10·lg of the lightly smoothed analytic-signal energy, dB re the direct sound; one value per sample from startIndex */
  levelsDb: Float64Array
  /** index in levelsDb of the direct sound's peak */
  directOffset: number
}

export interface EtcOptions {
  /** ms of curve before the direct sound; default 5 */
  preMs?: number
  /** ms of curve after the direct sound; default 100 */
  lengthMs?: number
}

/**
 * Energy-time curve 10·lg(h² + H{h}²), H the Hilbert transform, over the first
 * `lengthMs` after the direct sound, normalised to the direct sound. The energy is
 * averaged over about 0.1 ms (an odd number of samples, centred) so that the
 * Hilbert transform's alternate-sample ripple does not read as peaks.
 * @see REFERENCES.md, energy-time curve (from memory); Marple, IEEE Trans. SP 47(9), 1999 (analytic signal)
 */
export function energyTimeCurve(samples: ArrayLike<number>, sampleRate: number, opts: EtcOptions = {}): EnergyTimeCurve {
  const preMs = opts.preMs ?? 5
  const lengthMs = opts.lengthMs ?? 100
  const onset = findOnsetIndex(samples)
  const pad = Math.round(0.01 * sampleRate) // keeps the FFT's circular wrap away from the curve
  const start = Math.max(0, onset - Math.round((preMs / 1000) * sampleRate) - pad)
  const end = Math.min(samples.length, onset + Math.round(((lengthMs + 2) / 1000) * sampleRate) + pad)
  const raw = analyticEnergy(samples, start, end - start)
  const half = Math.max(1, Math.round((0.1e-3 * sampleRate) / 2))
  const smooth = movingAverage(raw, half)
  // the direct sound's peak: the largest envelope value within 1 ms of the onset
  const from = onset - start
  const to = Math.min(smooth.length, from + Math.max(2, Math.round(0.001 * sampleRate)))
  let d = from
  for (let i = from; i < to; i++) if (smooth[i] > smooth[d]) d = i
  const ref = smooth[d] > 0 ? smooth[d] : 1
  const first = Math.max(0, d - Math.round((preMs / 1000) * sampleRate))
  const last = Math.min(smooth.length, d + Math.round((lengthMs / 1000) * sampleRate) + 1)
  const levelsDb = new Float64Array(last - first)
  for (let i = first; i < last; i++) levelsDb[i - first] = 10 * Math.log10(smooth[i] / ref + 1e-30)
  const directOffset = d - first
  const frac = parabolicOffset(levelsDb, directOffset)
  return {
    directSoundMs: ((start + d + frac) / sampleRate) * 1000,
    startIndex: start + first,
    sampleRate,
    levelsDb,
    directOffset,
  }
}

function movingAverage(x: Float64Array, half: number): Float64Array {
  const y = new Float64Array(x.length)
  let acc = 0
  const width = 2 * half + 1
  for (let i = -half; i < x.length + half; i++) {
    const add = i + half
    if (add < x.length && add >= 0) acc += x[add]
    const drop = i - half - 1
    if (drop >= 0 && drop < x.length) acc -= x[drop]
    if (i >= 0 && i < x.length) y[i] = acc / width
  }
  return y
}

/** Sub-sample offset of a peak by a parabola through three points, in samples, in [−0.5, 0.5]. */
function parabolicOffset(y: ArrayLike<number>, i: number): number {
  if (i <= 0 || i >= y.length - 1) return 0
  const den = y[i - 1] - 2 * y[i] + y[i + 1]
  if (den >= 0) return 0
  return Math.max(-0.5, Math.min(0.5, (0.5 * (y[i - 1] - y[i + 1])) / den))
}

export interface MeasuredReflection {
  /** after the direct sound, ms */
  delayMs: number
  /** relative to the direct sound, dB */
  levelDb: number
}

export interface ReflectionSearch {
  /** only peaks up to this delay, ms; default 100 */
  maxDelayMs?: number
  /** ignore the direct sound's own lobe for this long, ms; default 0.5 */
  guardMs?: number
  /** weakest peak reported, dB re direct; default −30 */
  minLevelDb?: number
  /** a peak must stand this far above the lower of the valleys either side, dB; default 3 */
  minProminenceDb?: number
  /** two peaks closer than this are one (the stronger kept), ms; default 0.3 */
  minSeparationMs?: number
  /** at most this many, strongest first; default 30 */
  maxCount?: number
}

/**
 * Distinct peaks of the energy-time curve after the direct sound, strongest first.
 * A peak is distinct when it rises minProminenceDb above the higher of the two
 * valleys that separate it from taller neighbours (the usual topographic prominence).
 */
export function findReflections(etc: EnergyTimeCurve, opts: ReflectionSearch = {}): MeasuredReflection[] {
  const maxDelayMs = opts.maxDelayMs ?? 100
  const guard = Math.round(((opts.guardMs ?? 0.5) / 1000) * etc.sampleRate)
  const minLevel = opts.minLevelDb ?? -30
  const minProm = opts.minProminenceDb ?? 3
  const minSep = ((opts.minSeparationMs ?? 0.3) / 1000) * etc.sampleRate
  const maxCount = opts.maxCount ?? 30
  const y = etc.levelsDb
  const d = etc.directOffset
  const last = Math.min(y.length - 1, d + Math.round((maxDelayMs / 1000) * etc.sampleRate))
  const candidates: { i: number; level: number }[] = []
  for (let i = d + guard; i < last; i++) {
    if (!(y[i] >= minLevel && y[i] >= y[i - 1] && y[i] > y[i + 1])) continue
    let leftMin = y[i]
    let j = i - 1
    while (j >= d && y[j] <= y[i]) leftMin = Math.min(leftMin, y[j--])
    let rightMin = y[i]
    let k = i + 1
    while (k < y.length && y[k] <= y[i]) rightMin = Math.min(rightMin, y[k++])
    const prominence = y[i] - Math.max(leftMin, rightMin)
    if (prominence >= minProm) candidates.push({ i, level: y[i] })
  }
  candidates.sort((a, b) => b.level - a.level)
  const kept: { i: number; level: number }[] = []
  for (const c of candidates) {
    if (kept.length >= maxCount) break
    if (kept.every((k) => Math.abs(k.i - c.i) >= minSep)) kept.push(c)
  }
  return kept.map(({ i }) => {
    const frac = parabolicOffset(y, i)
    const level = y[i] - 0.25 * (y[i - 1] - y[i + 1]) * frac
    return { delayMs: round(((i + frac - d) / etc.sampleRate) * 1000, 4), levelDb: round(level, 2) }
  })
}

/**
 * The reflection window is the room engine's own (shared/acoustics: within `windowMs`,
 * louder than `thresholdDb`, defaults 20 ms and −20 dB), so measured and predicted
 * reflections are flagged alike.
 */
export { DEFAULT_REFLECTION_WINDOW, inReflectionWindow, type ReflectionWindow } from '../acoustics/reflections'

/** A predicted first-order reflection, as the room engine's `firstReflections` gives it. */
export interface PredictedReflection {
  surface: string
  delayMs: number
  levelDb: number
}

export interface ReflectionMatch {
  surface: string
  /** measured − predicted, ms */
  delayErrorMs: number
  /** measured − predicted, dB */
  levelErrorDb: number
}

/**
 * Pairs measured reflections with predicted ones: closest delays first, each
 * predicted surface used once, only pairs within toleranceMs (default 1 ms, about
 * 0.34 m of path: positions taken with a tape measure are rarely better; common
 * practice, no source). Surfaces with the same predicted delay (a symmetric room)
 * are joined as "left/right" so the advisor sees the ambiguity.
 * @returns one entry per measured reflection, null where nothing predicted is near
 */
export function matchReflections(
  measured: MeasuredReflection[],
  predicted: PredictedReflection[],
  opts: { toleranceMs?: number } = {},
): (ReflectionMatch | null)[] {
  const tol = opts.toleranceMs ?? 1
  const pairs: { m: number; p: number; err: number }[] = []
  measured.forEach((m, mi) =>
    predicted.forEach((p, pi) => {
      const err = Math.abs(m.delayMs - p.delayMs)
      if (err <= tol) pairs.push({ m: mi, p: pi, err })
    }),
  )
  pairs.sort((a, b) => a.err - b.err || Math.abs(measured[a.m].levelDb - predicted[a.p].levelDb) - Math.abs(measured[b.m].levelDb - predicted[b.p].levelDb))
  const result: (ReflectionMatch | null)[] = measured.map(() => null)
  const usedP = new Set<number>()
  for (const { m, p } of pairs) {
    if (result[m] || usedP.has(p)) continue
    const twins = predicted
      .map((q, qi) => ({ q, qi }))
      .filter(({ q, qi }) => !usedP.has(qi) && Math.abs(q.delayMs - predicted[p].delayMs) < 0.05)
    twins.forEach(({ qi }) => usedP.add(qi))
    result[m] = {
      surface: twins.map(({ q }) => q.surface).join('/'),
      delayErrorMs: round(measured[m].delayMs - predicted[p].delayMs, 3),
      levelErrorDb: round(measured[m].levelDb - predicted[p].levelDb, 2),
    }
  }
  return result
}

/**
 * Reduces a curve to at most maxPoints, keeping each bucket's largest value so
 * narrow peaks survive.
 */
export function downsampleMax(levelsDb: ArrayLike<number>, startMs: number, stepMs: number, maxPoints: number): { timesMs: number[]; levelsDb: number[] } {
  const bucket = Math.max(1, Math.ceil(levelsDb.length / maxPoints))
  const timesMs: number[] = []
  const out: number[] = []
  for (let b = 0; b < levelsDb.length; b += bucket) {
    let best = b
    for (let i = b; i < Math.min(levelsDb.length, b + bucket); i++) if (levelsDb[i] > levelsDb[best]) best = i
    timesMs.push(round(startMs + best * stepMs, 3))
    out.push(round(Math.max(levelsDb[best], -150), 2))
  }
  return { timesMs, levelsDb: out }
}
