/** Synthetic impulse responses with known answers, for the signal tests and the bench. */
import FFT from 'fft.js'
import * as wavefileModule from 'wavefile'
import { mulberry32 } from '../../../shared/prng'

const ns = wavefileModule as unknown as { WaveFile?: new () => any; default?: { WaveFile: new () => any } }
/** wavefile's class under either module shape (CommonJS in Node, ES module in bundlers). */
export const WaveFile = (ns.WaveFile ?? ns.default?.WaveFile) as new () => any

/** Seeded uniform [0, 1) generator (mulberry32), so every test is repeatable. */
export const rng: (seed: number) => () => number = mulberry32

/** Energy envelope e^(−A·t/T), A = 6·ln 10, as an amplitude: 60 dB of energy decay in T seconds. */
export const amplitudeEnvelope = (tS: number, rt: number) => Math.exp((-3 * Math.LN10 * tS) / rt)

/**
 * Broadband decay whose squared samples are exactly the exponential energy envelope
 * (random signs times the envelope), from sample `startIndex`, plus white noise of
 * the given mean square (uniform, so exactly bounded).
 */
export function exponentialDecay(opts: { rt: number; sampleRate: number; seconds: number; seed?: number; startIndex?: number; noiseMeanSquare?: number }): Float64Array {
  const { rt, sampleRate, seconds } = opts
  const r = rng(opts.seed ?? 1)
  const n = Math.round(seconds * sampleRate)
  const x = new Float64Array(n)
  const start = opts.startIndex ?? 0
  const noiseAmp = Math.sqrt(3 * (opts.noiseMeanSquare ?? 0))
  for (let i = 0; i < n; i++) {
    const decay = i >= start ? (r() < 0.5 ? -1 : 1) * amplitudeEnvelope((i - start) / sampleRate, rt) : 0
    x[i] = decay + noiseAmp * (2 * r() - 1)
  }
  return x
}

/**
 * Noise confined to [lowHz, highHz] (random phases, flat magnitude, built in the
 * frequency domain), unit mean square.
 */
export function bandNoise(lowHz: number, highHz: number, sampleRate: number, n: number, seed: number): Float64Array {
  let size = 4
  while (size < n) size *= 2
  const r = rng(seed)
  const spec = new Float64Array(2 * size)
  const k0 = Math.ceil((lowHz / sampleRate) * size)
  const k1 = Math.floor((highHz / sampleRate) * size)
  for (let k = k0; k <= k1; k++) {
    const ph = 2 * Math.PI * r()
    spec[2 * k] = Math.cos(ph)
    spec[2 * k + 1] = Math.sin(ph)
    spec[2 * (size - k)] = Math.cos(ph)
    spec[2 * (size - k) + 1] = -Math.sin(ph)
  }
  const out = new Float64Array(2 * size)
  new FFT(size).inverseTransform(out, spec)
  const x = new Float64Array(n)
  let ms = 0
  for (let i = 0; i < n; i++) {
    x[i] = out[2 * i]
    ms += x[i] * x[i]
  }
  const g = 1 / Math.sqrt(ms / n)
  for (let i = 0; i < n; i++) x[i] *= g
  return x
}

/**
 * Sum over octave bands of band noise (±1/6 octave around each centre) decaying with
 * that band's reverberation time.
 */
export function multibandDecay(rtByBand: Record<number, number>, sampleRate: number, seconds: number, seed = 7): Float64Array {
  const n = Math.round(seconds * sampleRate)
  const x = new Float64Array(n)
  let s = seed
  for (const [centre, rt] of Object.entries(rtByBand)) {
    const fc = Number(centre)
    const noise = bandNoise(fc * 2 ** (-1 / 6), fc * 2 ** (1 / 6), sampleRate, n, s++)
    for (let i = 0; i < n; i++) x[i] += noise[i] * amplitudeEnvelope(i / sampleRate, rt)
  }
  return x
}

/** Adds a band-limited pulse (windowed sinc, cutoff 0.45·fs) of amplitude `amp` at time tMs (fractional samples allowed). */
export function addPulse(x: Float64Array, sampleRate: number, tMs: number, amp: number): void {
  const t = (tMs / 1000) * sampleRate
  const half = 48
  for (let i = Math.max(0, Math.floor(t) - half); i <= Math.min(x.length - 1, Math.ceil(t) + half); i++) {
    const d = i - t
    if (Math.abs(d) > half) continue
    const sinc = d === 0 ? 1 : Math.sin(Math.PI * 0.9 * d) / (Math.PI * 0.9 * d)
    const w = 0.5 * (1 + Math.cos((Math.PI * d) / half))
    x[i] += amp * 0.9 * sinc * w
  }
}

/** Writes samples (±1 full scale) as a WAV in the given wavefile bit depth code. */
export function writeWav(channels: Float64Array[], sampleRate: number, bitDepth: '16' | '24' | '32' | '32f' | '8' | '64'): Uint8Array {
  const bits: Record<string, number> = { '8': 8, '16': 16, '24': 24, '32': 32 }
  const toCode = (v: number) => {
    if (bitDepth === '32f' || bitDepth === '64') return v
    const full = 2 ** (bits[bitDepth] - 1)
    const code = Math.max(-full, Math.min(full - 1, Math.round(v * full)))
    return bitDepth === '8' ? code + 128 : code
  }
  const data = channels.map((ch) => Array.from(ch, toCode))
  const wav = new WaveFile()
  wav.fromScratch(channels.length, sampleRate, bitDepth, channels.length === 1 ? data[0] : data)
  return wav.toBuffer()
}

/**
 * Sum over octave bands of a tone at the band's exact mid-band frequency (random
 * phase), decaying with that band's reverberation time: each band's energy then
 * decays smoothly at a known rate, without the fluctuations of a noise decay.
 */
export function multibandToneDecay(rtByBand: Record<number, number>, sampleRate: number, seconds: number, seed = 7): Float64Array {
  const n = Math.round(seconds * sampleRate)
  const x = new Float64Array(n)
  const r = rng(seed)
  const exact: Record<number, number> = { 63: 63.096, 125: 125.893, 250: 251.189, 500: 501.187, 1000: 1000, 2000: 1995.262, 4000: 3981.072, 8000: 7943.282 }
  for (const [centre, rt] of Object.entries(rtByBand)) {
    const f = exact[Number(centre)] ?? Number(centre)
    const phase = 2 * Math.PI * r()
    for (let i = 0; i < n; i++) x[i] += Math.SQRT2 * Math.sin((2 * Math.PI * f * i) / sampleRate + phase) * amplitudeEnvelope(i / sampleRate, rt)
  }
  return x
}
