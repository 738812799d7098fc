/**
 * Analysis of one impulse response: the engine's `analyzeImpulseResponse` contract
 * and the fuller `analyzeMeasurement` behind the case page's plots.
 */
import { filterSos, octaveBandFilter, octaveBands, thirdOctaveBands } from './bands'
import { analyzeDecay, round, type DecayFigures } from './decay'
import {
  DEFAULT_REFLECTION_WINDOW,
  downsampleMax,
  energyTimeCurve,
  findOnsetIndex,
  findReflections,
  inReflectionWindow,
  matchReflections,
  type MeasuredReflection,
  type PredictedReflection,
  type ReflectionMatch,
  type ReflectionWindow,
} from './etc'
import { lowFrequencyDecay, type LowFrequencyDecay } from './low-frequency'
import { bandLevelsDb, peaksAndNulls, powerSpectrum, smoothedResponse, smoothSpectrumDb, logFrequencies, type SmoothedResponse, type SpectralExtremum } from './spectrum'
import type { MeasurementWarning } from './errors'

/** The engine's contract (ENGINE.md). */
export interface IrAnalysis {
  bands: { centerHz: number; edt: number | null; t20: number | null; t30: number | null }[]
  broadband: { edt: number | null; t20: number | null; t30: number | null }
  directSoundMs: number
  reflections: { delayMs: number; levelDb: number }[]
}

function checkInput(samples: ArrayLike<number>, sampleRate: number): void {
  if (!Number.isFinite(sampleRate) || sampleRate < 8000) throw new RangeError(`sample rate must be at least 8000 Hz: got ${sampleRate}`)
  if (samples.length < 0.01 * sampleRate) {
    throw new RangeError(`impulse response too short: ${samples.length} samples (${((samples.length / sampleRate) * 1000).toFixed(2)} ms) < 10 ms`)
  }
  let peak = 0
  for (let i = 0; i < samples.length; i++) {
    const v = samples[i]
    if (!Number.isFinite(v)) throw new RangeError(`impulse response holds a non-finite sample (${v}) at index ${i}`)
    if (Math.abs(v) > peak) peak = Math.abs(v)
  }
  if (peak === 0) throw new RangeError('impulse response is all zeros: there is no decay to analyse')
}

/** Octave bands 63–8000 Hz whose upper edge lies below the Nyquist frequency. */
function usableOctaves(sampleRate: number) {
  return octaveBands(63, 8000).filter((b) => b.highHz < sampleRate / 2)
}

interface BandDecay extends DecayFigures {
  centerHz: number
  /** bandwidth × reverberation time below 16: the band filter may lengthen this decay. @see ISO 3382-2:2008 §5.3 (B·T > 16, from memory) */
  filterLimited: boolean
}

function decays(samples: ArrayLike<number>, sampleRate: number, onset: number, curvePoints: number): { bands: BandDecay[]; broadband: DecayFigures } {
  const bands = usableOctaves(sampleRate).map((band) => {
    const filtered = filterSos(samples, octaveBandFilter(band, sampleRate))
    const d = analyzeDecay(filtered, sampleRate, onset, curvePoints)
    const t = d.t30 ?? d.t20 ?? d.edt
    return { centerHz: band.nominalHz, ...d, filterLimited: t !== null && (band.highHz - band.lowHz) * t < 16 }
  })
  return { bands, broadband: analyzeDecay(samples, sampleRate, onset, curvePoints) }
}

/**
 * Octave-band and broadband EDT, T20 and T30, the direct sound's arrival and the
 * early reflections (distinct energy-time-curve peaks within 50 ms, strongest first).
 * @param samples impulse response, any scale
 * @param sampleRate Hz, at least 8000
 * @throws RangeError for a sample rate below 8000 Hz, NaN/∞ samples, an all-zero or sub-10 ms response
 */
export function analyzeImpulseResponse(samples: Float32Array | Float64Array, sampleRate: number): IrAnalysis {
  checkInput(samples, sampleRate)
  const onset = findOnsetIndex(samples)
  const { bands, broadband } = decays(samples, sampleRate, onset, 0)
  const etc = energyTimeCurve(samples, sampleRate, { lengthMs: 50 })
  const reflections = findReflections(etc, { maxDelayMs: 50 })
  const pick = (d: DecayFigures) => ({ edt: d.edt, t20: d.t20, t30: d.t30 })
  return {
    bands: bands.map((b) => ({ centerHz: b.centerHz, ...pick(b) })),
    broadband: pick(broadband),
    directSoundMs: etc.directSoundMs,
    reflections,
  }
}

export interface AnalyzedReflection extends MeasuredReflection {
  /** inside the reflection window (arrives within windowMs, louder than thresholdDb) */
  inWindow: boolean
  /** the predicted first-order reflection it most probably is, when predictions were given */
  match: ReflectionMatch | null
}

export interface MeasurementAnalysis {
  sampleRate: number
  durationS: number
  directSoundMs: number
  /** octave bands 63–8000 Hz (those below Nyquist) with decay figures, energy ratios and decay curves */
  bands: BandDecay[]
  broadband: DecayFigures
  /** energy-time curve, dB re direct, times re direct (−5…100 ms), at most 400 points (each the largest of its bucket) */
  etc: { timesMs: number[]; levelsDb: number[] }
  /** distinct energy-time-curve peaks within 100 ms, strongest first */
  reflections: AnalyzedReflection[]
  reflectionWindow: ReflectionWindow
  /** FFT of the first second after the onset, smoothed 1/1 … 1/24 octave, 15 Hz up */
  frequencyResponse: SmoothedResponse
  /** one-third-octave band levels, dB re full scale, from the same spectrum */
  thirdOctaveLevels: { centerHz: number; levelDb: number }[]
  lowFrequency: {
    /** from the 1/24-octave curve, 20–300 Hz, at least 3 dB prominent */
    peaks: SpectralExtremum[]
    nulls: SpectralExtremum[]
    /** highest minus lowest level of the 1/6-octave curve, 20–300 Hz, dB */
    spreadDb: number
    decay: LowFrequencyDecay
  }
  warnings: MeasurementWarning[]
}

export interface MeasurementOptions {
  /** predicted first-order reflections of the case's room (the engine's firstReflections) */
  predicted?: PredictedReflection[]
  reflectionWindow?: Partial<ReflectionWindow>
  /** delay tolerance when matching reflections to predictions, ms; default 1 */
  matchToleranceMs?: number
}

/** Low-frequency peaks, nulls and spread of a spectrum. */
export function lowFrequencySummary(spec: ReturnType<typeof powerSpectrum>, minHz = 20, maxHz = 300) {
  const freqs = logFrequencies(minHz, maxHz, 48)
  const fine = smoothSpectrumDb(spec, freqs, 24)
  const sixth = smoothSpectrumDb(spec, freqs, 6)
  const { peaks, nulls } = peaksAndNulls(freqs, fine, { minProminenceDb: 3 })
  return { peaks, nulls, spreadDb: round(Math.max(...sixth) - Math.min(...sixth), 2) }
}

/**
 * Everything the case page shows for one impulse response.
 * @throws RangeError as analyzeImpulseResponse
 */
export function analyzeMeasurement(samples: Float32Array | Float64Array, sampleRate: number, opts: MeasurementOptions = {}): MeasurementAnalysis {
  checkInput(samples, sampleRate)
  const onset = findOnsetIndex(samples)
  const { bands, broadband } = decays(samples, sampleRate, onset, 150)
  const etcFull = energyTimeCurve(samples, sampleRate, { preMs: 5, lengthMs: 100 })
  const window: ReflectionWindow = { ...DEFAULT_REFLECTION_WINDOW, ...opts.reflectionWindow }
  const found = findReflections(etcFull, { maxDelayMs: 100 })
  const matches = opts.predicted?.length ? matchReflections(found, opts.predicted, { toleranceMs: opts.matchToleranceMs }) : found.map(() => null)
  const reflections = found.map((r, i) => ({ ...r, inWindow: inReflectionWindow(r, window), match: matches[i] }))
  const etc = downsampleMax(etcFull.levelsDb, ((-etcFull.directOffset) / sampleRate) * 1000, 1000 / sampleRate, 400)

  const start = Math.max(0, onset - Math.round(0.002 * sampleRate))
  const spec = powerSpectrum(samples, sampleRate, start, Math.round(1.0 * sampleRate), { fadeFraction: 0.1 })
  const topHz = Math.min(20000, 0.9 * (sampleRate / 2))
  const thirds = thirdOctaveBands(20, 20000).filter((b) => b.highHz < sampleRate / 2)
  const warnings: MeasurementWarning[] = []
  if (broadband.dynamicRangeDb < 45) {
    warnings.push({ code: 'low-dynamic-range', message: `the response stands only ${broadband.dynamicRangeDb.toFixed(1)} dB above its noise floor; T30 needs 45 dB (ISO 3382-2)` })
  }
  return {
    sampleRate,
    durationS: samples.length / sampleRate,
    directSoundMs: round(etcFull.directSoundMs, 4),
    bands,
    broadband,
    etc,
    reflections,
    reflectionWindow: window,
    frequencyResponse: smoothedResponse(spec, 15, topHz, 24),
    thirdOctaveLevels: bandLevelsDb(spec, thirds),
    lowFrequency: { ...lowFrequencySummary(spec), decay: lowFrequencyDecay(samples, sampleRate, onset) },
    warnings,
  }
}
