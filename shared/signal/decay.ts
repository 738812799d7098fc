/**
 * Energy decay of an impulse response: noise-floor truncation and compensation,
 * Schroeder backward integration, EDT/T20/T30, curvature and the energy ratios.
 */

/** Least dynamic range (peak of the squared response over the noise floor) per figure: range + 15 dB. @see ISO 3382-2:2008 §5.3 */
export const MIN_DYNAMIC_RANGE_DB = { edt: 25, t20: 35, t30: 45 } as const

/** ISO 3382-2 evaluation ranges on the decay curve, dB below its start. */
export const EVALUATION_RANGES = { edt: [0, -10], t20: [-5, -25], t30: [-5, -35] } as const

export interface Truncation {
  /** sample (from the start of the energy signal) where the decay meets the noise floor */
  crossIndex: number
  /** mean square of the background noise, same units as the energy signal */
  noiseEnergy: number
  /** slope of the late decay, dB per second (negative); null when no decay was found */
  lateSlopeDbPerS: number | null
  /** energy the decay would have carried after crossIndex had there been no noise */
  compensation: number
}

function blockLevelsDb(e: ArrayLike<number>, blockLen: number): { centre: Float64Array; db: Float64Array } {
  const count = Math.floor(e.length / blockLen)
  const centre = new Float64Array(count)
  const db = new Float64Array(count)
  for (let b = 0; b < count; b++) {
    let sum = 0
    const start = b * blockLen
    for (let i = start; i < start + blockLen; i++) sum += e[i]
    centre[b] = start + (blockLen - 1) / 2
    db[b] = 10 * Math.log10(sum / blockLen + 1e-300)
  }
  return { centre, db }
}

function lineFit(x: ArrayLike<number>, y: ArrayLike<number>, from: number, to: number): { slope: number; intercept: number } | null {
  const n = to - from
  if (n < 2) return null
  let sx = 0
  let sy = 0
  let sxx = 0
  let sxy = 0
  const x0 = x[from]
  for (let i = from; i < to; i++) {
    const xi = x[i] - x0
    sx += xi
    sy += y[i]
    sxx += xi * xi
    sxy += xi * y[i]
  }
  const den = n * sxx - sx * sx
  if (den <= 0) return null
  const slope = (n * sxy - sx * sy) / den
  return { slope, intercept: (sy - slope * sx) / n - slope * x0 }
}

function meanFrom(e: ArrayLike<number>, from: number): number {
  let sum = 0
  for (let i = from; i < e.length; i++) sum += e[i]
  return sum / Math.max(1, e.length - from)
}

/**
 * Where the decay meets the background noise, the noise level, and the energy lost
 * by truncating there, by the iterative procedure of Lundeby et al.: 10 ms local
 * averages, noise from the last 10 %, a first regression down to 10 dB above the
 * noise, then up to five iterations with 5 averaging intervals per 10 dB of decay,
 * the noise taken from 10 dB of decay past the crossing (at least the last 10 %),
 * and the late slope fitted from 30 to 10 dB above the noise. The compensation is the
 * exponential continuation of the late slope from the crossing point to infinity.
 * @see Lundeby, Vigran, Bietz & Vorländer, "Uncertainties of measurements in room acoustics", Acustica 81 (1995) 344–355
 * @param energy squared impulse response from the start of the decay
 */
export function lundebyTruncation(energy: ArrayLike<number>, sampleRate: number): Truncation {
  const n = energy.length
  let peak = 0
  for (let i = 0; i < n; i++) if (energy[i] > peak) peak = energy[i]
  const floorEnergy = peak * 1e-30
  const fail = (noise: number): Truncation => ({ crossIndex: n - 1, noiseEnergy: Math.max(noise, floorEnergy), lateSlopeDbPerS: null, compensation: 0 })
  if (peak <= 0 || n < 16) return fail(0)

  let blockLen = Math.max(1, Math.min(Math.round(0.01 * sampleRate), Math.floor(n / 10)))
  let noise = Math.max(meanFrom(energy, Math.floor(0.9 * n)), floorEnergy)
  let blocks = blockLevelsDb(energy, blockLen)
  let iMax = 0
  for (let i = 1; i < blocks.db.length; i++) if (blocks.db[i] > blocks.db[iMax]) iMax = i
  let noiseDb = 10 * Math.log10(noise)
  let iEnd = iMax + 1
  while (iEnd < blocks.db.length && blocks.db[iEnd] >= noiseDb + 10) iEnd++
  let fit = lineFit(blocks.centre, blocks.db, iMax, iEnd)
  if (!fit || fit.slope >= 0) return fail(noise)
  let cross = (noiseDb - fit.intercept) / fit.slope

  for (let iter = 0; iter < 5; iter++) {
    const samplesPer10Db = 10 / -fit.slope
    blockLen = Math.max(1, Math.min(Math.round(samplesPer10Db / 5), Math.floor(n / 10)))
    blocks = blockLevelsDb(energy, blockLen)
    const noiseStart = Math.max(0, Math.min(Math.round(cross + samplesPer10Db), Math.floor(0.9 * n)))
    noise = Math.max(meanFrom(energy, noiseStart), floorEnergy)
    noiseDb = 10 * Math.log10(noise)
    iMax = 0
    for (let i = 1; i < blocks.db.length; i++) if (blocks.db[i] > blocks.db[iMax]) iMax = i
    let from = iMax
    while (from < blocks.db.length && blocks.db[from] >= noiseDb + 30) from++
    if (from > iMax) from-- // keep the last block above the 30 dB mark so a short late range still fits
    let to = from + 1
    while (to < blocks.db.length && blocks.db[to] >= noiseDb + 10) to++
    const next = lineFit(blocks.centre, blocks.db, from, to)
    if (!next || next.slope >= 0) break
    fit = next
    const nextCross = (noiseDb - fit.intercept) / fit.slope
    const converged = Math.abs(nextCross - cross) < blockLen
    cross = nextCross
    if (converged) break
  }
  const crossIndex = Math.max(1, Math.min(n - 1, Math.round(cross)))
  const q = 10 ** (fit.slope / 10) // energy ratio per sample along the late slope
  const levelAtCross = 10 ** ((fit.intercept + fit.slope * crossIndex) / 10)
  return {
    crossIndex,
    noiseEnergy: noise,
    lateSlopeDbPerS: fit.slope * sampleRate,
    compensation: (levelAtCross * q) / (1 - q),
  }
}

/**
 * Backward-integrated decay curve, dB re its value at the start, up to the crossing
 * point (inclusive), plus the compensation for the truncated tail; every stride-th
 * sample of it (the curve is smooth, so a fit on a subsampled curve is the same fit).
 * @see Schroeder, "New method of measuring reverberation time", JASA 37 (1965) 409–412
 */
export function schroederCurveDb(energy: ArrayLike<number>, crossIndex: number, compensation = 0, stride = 1): Float64Array {
  const curve = new Float64Array(Math.floor(crossIndex / stride) + 1)
  let acc = compensation
  for (let i = crossIndex; i >= 0; i--) {
    acc += energy[i]
    if (i % stride === 0) curve[i / stride] = acc
  }
  const total = curve[0]
  for (let i = 0; i < curve.length; i++) curve[i] = 10 * Math.log10(curve[i] / total + 1e-300)
  return curve
}

/**
 * Reverberation time from a least-squares line fitted to the decay curve between
 * topDb and bottomDb (both ≤ 0), extrapolated to 60 dB; null when the curve does
 * not reach bottomDb.
 * @see ISO 3382-2:2008 §5.3 (T = −60/slope)
 * @returns seconds
 */
export function fitReverberationTime(curveDb: ArrayLike<number>, sampleRate: number, topDb: number, bottomDb: number): number | null {
  let top = -1
  let bottom = -1
  for (let i = 0; i < curveDb.length; i++) {
    if (top < 0 && curveDb[i] <= topDb) top = i
    if (curveDb[i] <= bottomDb) {
      bottom = i
      break
    }
  }
  if (top < 0 || bottom < 0 || bottom - top < 2) return null
  let sx = 0
  let sy = 0
  let sxx = 0
  let sxy = 0
  const n = bottom - top + 1
  for (let i = top; i <= bottom; i++) {
    const x = (i - top) / sampleRate
    sx += x
    sy += curveDb[i]
    sxx += x * x
    sxy += x * curveDb[i]
  }
  const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx)
  return slope < 0 ? -60 / slope : null
}

export interface DecayFigures {
  /** seconds; null where the dynamic range is too small (MIN_DYNAMIC_RANGE_DB) or the curve too short */
  edt: number | null
  t20: number | null
  t30: number | null
  /** peak of the squared response over the background noise, dB */
  dynamicRangeDb: number
  /** 100·(T30/T20 − 1), %; above 10 % the decay is not a single straight line. @see ISO 3382-2:2008 Annex B */
  curvaturePct: number | null
  /** dB. @see ISO 3382-1:2009 Annex A.2.4 */
  c50: number | null
  c80: number | null
  /** 0…1. @see ISO 3382-1:2009 Annex A.2.4 */
  d50: number | null
  /** where the decay was truncated at the noise floor, ms after the start of the decay */
  truncationMs: number
  /** the decay curve for plotting, downsampled */
  curve: { timesMs: number[]; levelsDb: number[] }
}

/**
 * Decay figures of one signal (a band or the broadband response).
 * @param signal impulse response samples
 * @param onsetIndex sample where the decay starts (the direct sound's onset)
 * @param maxCurvePoints points kept in the plotted decay curve
 */
export function analyzeDecay(signal: ArrayLike<number>, sampleRate: number, onsetIndex: number, maxCurvePoints = 150): DecayFigures {
  const n = signal.length - onsetIndex
  const energy = new Float64Array(Math.max(0, n))
  let peak = 0
  for (let i = 0; i < n; i++) {
    const v = signal[onsetIndex + i]
    energy[i] = v * v
    if (energy[i] > peak) peak = energy[i]
  }
  const trunc = lundebyTruncation(energy, sampleRate)
  const dynamicRangeDb = peak > 0 ? 10 * Math.log10(peak / trunc.noiseEnergy) : 0
  const empty: DecayFigures = {
    edt: null, t20: null, t30: null, dynamicRangeDb, curvaturePct: null, c50: null, c80: null, d50: null,
    truncationMs: (trunc.crossIndex / sampleRate) * 1000, curve: { timesMs: [], levelsDb: [] },
  }
  if (trunc.lateSlopeDbPerS === null || dynamicRangeDb < 15) return empty
  // fit on the curve at about 8 kHz: plenty for the slopes, a sixth of the logarithms at 48 kHz
  const stride = Math.max(1, Math.floor(sampleRate / 8000))
  const curveRate = sampleRate / stride
  const curve = schroederCurveDb(energy, trunc.crossIndex, trunc.compensation, stride)
  const figure = (key: keyof typeof EVALUATION_RANGES): number | null =>
    dynamicRangeDb >= MIN_DYNAMIC_RANGE_DB[key] ? fitReverberationTime(curve, curveRate, EVALUATION_RANGES[key][0], EVALUATION_RANGES[key][1]) : null
  const edt = figure('edt')
  const t20 = figure('t20')
  const t30 = figure('t30')

  let total = trunc.compensation
  for (let i = 0; i <= trunc.crossIndex; i++) total += energy[i]
  const early = (ms: number): number => {
    const end = Math.min(trunc.crossIndex + 1, Math.round((ms / 1000) * sampleRate))
    let sum = 0
    for (let i = 0; i < end; i++) sum += energy[i]
    return sum
  }
  const e50 = early(50)
  const e80 = early(80)
  const ratioDb = (e: number): number | null => (total - e > 0 ? 10 * Math.log10(e / (total - e)) : null)

  const step = Math.max(1, Math.ceil(curve.length / maxCurvePoints))
  const timesMs: number[] = []
  const levelsDb: number[] = []
  for (let i = 0; i < curve.length; i += step) {
    timesMs.push(round((i / curveRate) * 1000, 2))
    levelsDb.push(round(curve[i], 2))
  }
  return {
    edt, t20, t30, dynamicRangeDb,
    curvaturePct: t20 !== null && t30 !== null ? 100 * (t30 / t20 - 1) : null,
    c50: ratioDb(e50), c80: ratioDb(e80), d50: total > 0 ? e50 / total : null,
    truncationMs: empty.truncationMs,
    curve: { timesMs, levelsDb },
  }
}

export function round(x: number, digits: number): number {
  const f = 10 ** digits
  return Math.round(x * f) / f
}
