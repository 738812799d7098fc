/**
 * Frequency response of an impulse response, fractional-octave smoothing, band
 * levels and the low-frequency peaks and nulls.
 */
import { nextPow2, realSpectrum } from './fft'
import { round } from './decay'
import type { Band } from './bands'

/** A magnitude spectrum on a linear frequency grid: power |H|² per bin. */
export interface PowerSpectrum {
  binHz: number
  power: Float64Array
}

/**
 * Power spectrum of x[offset … offset+length) with a half-Hann fade over its last
 * fadeFraction, zero-padded to a power of two at least minBins long.
 */
export function powerSpectrum(
  x: ArrayLike<number>,
  sampleRate: number,
  offset = 0,
  length = x.length - offset,
  opts: { fadeFraction?: number; minSize?: number } = {},
): PowerSpectrum {
  const len = Math.max(1, Math.min(length, x.length - offset))
  const fade = Math.floor(len * (opts.fadeFraction ?? 0.1))
  const seg = new Float64Array(len)
  for (let i = 0; i < len; i++) {
    let w = 1
    const k = i - (len - fade)
    if (fade > 0 && k >= 0) w = 0.5 * (1 + Math.cos((Math.PI * (k + 1)) / (fade + 1)))
    seg[i] = x[offset + i] * w
  }
  const size = nextPow2(Math.max(len, opts.minSize ?? 0))
  const spec = realSpectrum(seg, size)
  const power = new Float64Array(size / 2 + 1)
  for (let k = 0; k <= size / 2; k++) power[k] = spec[2 * k] * spec[2 * k] + spec[2 * k + 1] * spec[2 * k + 1]
  return { binHz: sampleRate / size, power }
}

/** Log-spaced frequencies from minHz to maxHz, pointsPerOctave per octave. */
export function logFrequencies(minHz: number, maxHz: number, pointsPerOctave: number): number[] {
  const n = Math.floor(Math.log2(maxHz / minHz) * pointsPerOctave) + 1
  return Array.from({ length: n }, (_, i) => minHz * 2 ** (i / pointsPerOctave))
}

function prefixSums(p: Float64Array): Float64Array {
  const s = new Float64Array(p.length + 1)
  for (let i = 0; i < p.length; i++) s[i + 1] = s[i] + p[i]
  return s
}

function interpolatedPower(spec: PowerSpectrum, hz: number): number {
  const pos = hz / spec.binHz
  const i = Math.min(spec.power.length - 2, Math.floor(pos))
  const t = pos - i
  return spec.power[i] * (1 - t) + spec.power[i + 1] * t
}

/**
 * Fractional-octave smoothing: at each output frequency f, the mean power of the bins
 * in [f·2^(−1/(2n)), f·2^(1/(2n))] (a rectangular window on a log-frequency axis),
 * in dB; where the window holds no bin, the power interpolated at f.
 * @see Hatziantoniou & Mourjopoulos, "Generalized fractional-octave smoothing of audio and acoustic responses", JAES 48(4), 2000
 * @param fraction n, the window being 1/n octave wide
 */
export function smoothSpectrumDb(spec: PowerSpectrum, freqsHz: number[], fraction: number): number[] {
  const sums = prefixSums(spec.power)
  const half = 2 ** (1 / (2 * fraction))
  return freqsHz.map((f) => {
    const lo = Math.ceil(f / half / spec.binHz)
    const hi = Math.min(spec.power.length - 1, Math.floor((f * half) / spec.binHz))
    const p = hi >= lo ? (sums[hi + 1] - sums[lo]) / (hi - lo + 1) : interpolatedPower(spec, f)
    return 10 * Math.log10(p + 1e-30)
  })
}

/** Band level, dB: 10·lg of the summed power of the bins inside each band (Parseval). */
export function bandLevelsDb(spec: PowerSpectrum, bands: Band[]): { centerHz: number; levelDb: number }[] {
  const sums = prefixSums(spec.power)
  return bands.map((b) => {
    const lo = Math.ceil(b.lowHz / spec.binHz)
    const hi = Math.min(spec.power.length - 1, Math.floor(b.highHz / spec.binHz))
    const p = hi >= lo ? sums[hi + 1] - sums[lo] : interpolatedPower(spec, b.exactHz)
    return { centerHz: b.nominalHz, levelDb: round(10 * Math.log10(p + 1e-30), 2) }
  })
}

export interface SpectralExtremum {
  hz: number
  levelDb: number
  /** height above (peak) or depth below (null) the higher of the neighbouring valleys / lower of the neighbouring crests, dB */
  prominenceDb: number
}

/**
 * Peaks and nulls of a curve: local extrema standing at least minProminenceDb
 * proud of their surroundings (topographic prominence), within [minHz, maxHz].
 */
export function peaksAndNulls(
  freqsHz: number[],
  levelsDb: number[],
  opts: { minHz?: number; maxHz?: number; minProminenceDb?: number } = {},
): { peaks: SpectralExtremum[]; nulls: SpectralExtremum[] } {
  const minHz = opts.minHz ?? 0
  const maxHz = opts.maxHz ?? Infinity
  const minProm = opts.minProminenceDb ?? 3
  const idx = freqsHz.map((f, i) => i).filter((i) => freqsHz[i] >= minHz && freqsHz[i] <= maxHz)
  const f = idx.map((i) => freqsHz[i])
  const find = (y: number[]): SpectralExtremum[] => {
    const out: SpectralExtremum[] = []
    for (let i = 1; i < y.length - 1; i++) {
      if (!(y[i] >= y[i - 1] && y[i] > y[i + 1])) continue
      let leftMin = y[i]
      for (let j = i - 1; j >= 0 && y[j] <= y[i]; j--) leftMin = Math.min(leftMin, y[j])
      let rightMin = y[i]
      for (let k = i + 1; k < y.length && y[k] <= y[i]; k++) rightMin = Math.min(rightMin, y[k])
      const prom = y[i] - Math.max(leftMin, rightMin)
      if (prom >= minProm) out.push({ hz: round(f[i], 2), levelDb: round(y[i], 2), prominenceDb: round(prom, 2) })
    }
    return out
  }
  const y = idx.map((i) => levelsDb[i])
  const peaks = find(y)
  const nulls = find(y.map((v) => -v)).map((e) => ({ ...e, levelDb: -e.levelDb }))
  return { peaks, nulls }
}

export const SMOOTHING_FRACTIONS = [1, 3, 6, 12, 24] as const
export type SmoothingFraction = (typeof SMOOTHING_FRACTIONS)[number]

export interface SmoothedResponse {
  /** log-spaced, shared by every curve */
  freqsHz: number[]
  /** one curve per smoothing: 1/1, 1/3, 1/6, 1/12 and 1/24 octave; dB (re full-scale impulse for a WAV) */
  curves: { fraction: SmoothingFraction; levelsDb: number[] }[]
}

/** Every smoothing of one spectrum on one log-frequency grid. */
export function smoothedResponse(spec: PowerSpectrum, minHz: number, maxHz: number, pointsPerOctave = 24): SmoothedResponse {
  const freqsHz = logFrequencies(minHz, maxHz, pointsPerOctave)
  return {
    freqsHz: freqsHz.map((f) => round(f, 2)),
    curves: SMOOTHING_FRACTIONS.map((fraction) => ({ fraction, levelsDb: smoothSpectrumDb(spec, freqsHz, fraction).map((v) => round(v, 2)) })),
  }
}

/**
 * A spectrum given as points (a frequency-response text file) turned into a
 * PowerSpectrum on a fine linear grid by interpolating dB linearly in log frequency,
 * so the same smoothing applies to files and impulse responses.
 */
export function spectrumFromPoints(freqsHz: number[], levelsDb: number[], binHz: number): PowerSpectrum {
  const maxHz = freqsHz[freqsHz.length - 1]
  const count = Math.floor(maxHz / binHz) + 2
  const power = new Float64Array(count)
  let j = 0
  for (let k = 0; k < count; k++) {
    const f = k * binHz
    let db: number
    if (f <= freqsHz[0]) db = levelsDb[0]
    else if (f >= maxHz) db = levelsDb[levelsDb.length - 1]
    else {
      while (freqsHz[j + 1] < f) j++
      const t = Math.log(f / freqsHz[j]) / Math.log(freqsHz[j + 1] / freqsHz[j])
      db = levelsDb[j] + t * (levelsDb[j + 1] - levelsDb[j])
    }
    power[k] = 10 ** (db / 10)
  }
  return { binHz, power }
}
