/**
 * Low-frequency decay: spectra at successive time offsets (for a waterfall plot) and,
 * per one-third-octave band below 300 Hz, the time the band takes to fall 30 dB.
 */
import { butterworthBandpass, butterworthLowpass, filterSos, thirdOctaveBands } from './bands'
import { analyzeDecay, round } from './decay'
import { logFrequencies, powerSpectrum, smoothSpectrumDb } from './spectrum'

/** Decimated copy for the analyses below 300 Hz: zero-phase 8th-order Butterworth low-pass at 400 Hz, then every factor-th sample (about 2 kHz). */
export function decimateForLowFrequencies(samples: ArrayLike<number>, sampleRate: number): { samples: Float64Array; sampleRate: number; factor: number } {
  const factor = Math.max(1, Math.floor(sampleRate / 2000))
  if (factor === 1) return { samples: Float64Array.from(samples as ArrayLike<number>), sampleRate, factor }
  const lp = butterworthLowpass(400, sampleRate, 8)
  const forward = filterSos(samples, lp)
  forward.reverse()
  const both = filterSos(forward, lp)
  both.reverse()
  const out = new Float64Array(Math.floor(both.length / factor))
  for (let i = 0; i < out.length; i++) out[i] = both[i * factor]
  return { samples: out, sampleRate: sampleRate / factor, factor }
}

export interface LowFrequencyDecay {
  /** 15–300 Hz, log-spaced, 48 per octave */
  freqsHz: number[]
  /** offsets after the direct sound's onset: 0, 20, … 300 ms */
  timesMs: number[]
  /** levelsDb[t][f], dB re the loudest point of the first spectrum; 1/24-octave smoothed */
  levelsDb: number[][]
  /** per one-third-octave band 20–250 Hz: time for the band's decay curve to fall 30 dB, ms; null where its dynamic range is under 45 dB */
  bandFall30: { centerHz: number; fall30Ms: number | null; dynamicRangeDb: number }[]
}

/**
 * Each spectrum is taken over 500 ms from its offset, rectangular at the start and
 * with a half-Hann fade over the last quarter (a cumulative-spectral-decay style
 * window). The band decays use time-reversed filtering, so the band filter's own
 * ringing falls before the onset instead of lengthening the decay.
 * @see Rasmussen, Rindel & Henriksen, JAES 39(1/2), 1991 (time-reversed filtering for short low-frequency decays; from memory)
 * Only the first 4 s after the onset are used.
 * @param onsetIndex the direct sound's onset at the original sample rate
 */
export function lowFrequencyDecay(samples: ArrayLike<number>, sampleRate: number, onsetIndex: number): LowFrequencyDecay {
  // 4 s after the onset holds any domestic room's low-frequency decay and keeps the low-pass cheap
  const end = Math.min(samples.length, onsetIndex + 4 * sampleRate)
  const head = 'subarray' in samples ? (samples as Float64Array).subarray(0, end) : Array.from(samples).slice(0, end)
  const dec = decimateForLowFrequencies(head, sampleRate)
  const onset = Math.floor(onsetIndex / dec.factor)
  const fsD = dec.sampleRate
  const freqs = logFrequencies(15, 300, 48)
  const timesMs = Array.from({ length: 16 }, (_, i) => i * 20)
  const window = Math.round(0.5 * fsD)
  const raw = timesMs.map((t) => {
    const offset = onset + Math.round((t / 1000) * fsD)
    if (offset >= dec.samples.length - 8) return freqs.map(() => -300)
    const spec = powerSpectrum(dec.samples, fsD, offset, window, { fadeFraction: 0.25, minSize: 4096 })
    return smoothSpectrumDb(spec, freqs, 24)
  })
  const ref = Math.max(...raw[0])
  const levelsDb = raw.map((row) => row.map((v) => round(Math.max(v - ref, -120), 2)))

  const bandFall30 = thirdOctaveBands(20, 250).map((band) => {
    const sections = butterworthBandpass(band.lowHz, band.highHz, fsD, 3)
    const reversed = Float64Array.from(dec.samples).reverse()
    const filtered = filterSos(reversed, sections).reverse()
    const decay = analyzeDecay(filtered, fsD, onset, 4000)
    let fall30Ms: number | null = null
    if (decay.dynamicRangeDb >= 45) {
      const i = decay.curve.levelsDb.findIndex((v) => v <= -30)
      if (i >= 0) fall30Ms = decay.curve.timesMs[i]
    }
    return { centerHz: band.nominalHz, fall30Ms, dynamicRangeDb: round(decay.dynamicRangeDb, 1) }
  })
  return { freqsHz: freqs.map((f) => round(f, 2)), timesMs, levelsDb, bandFall30 }
}
