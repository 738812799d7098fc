/**
 * WAV decoding for measurement files, through the `wavefile` package, with checks
 * that turn every way a file can be unusable into a MeasurementFileError.
 */
import * as wavefileModule from 'wavefile'
import { MeasurementFileError, type MeasurementWarning } from './errors'

// Node resolves wavefile to its CommonJS build (the class under `default`), bundlers to its ES module (a named export).
type WaveFileInstance = {
  container: string
  fmt: { audioFormat: number; numChannels: number; sampleRate: number; bitsPerSample: number; blockAlign: number }
  data: { chunkSize: number; samples: Uint8Array }
  ds64?: { dataChunkSizeHigh?: number; dataChunkSizeLow?: number }
  bitDepth: string
  fromBuffer(bytes: Uint8Array, samples?: boolean): void
  getSamples(interleaved?: boolean, OutputObject?: Function): Float64Array | Float64Array[]
}
const ns = wavefileModule as unknown as { WaveFile?: new () => WaveFileInstance; default?: { WaveFile: new () => WaveFileInstance } }
const WaveFile = (ns.WaveFile ?? ns.default?.WaveFile) as new () => WaveFileInstance

export const SUPPORTED_SAMPLE_RATES = [44100, 48000, 88200, 96000] as const
export const MAX_DURATION_S = 30
/** shortest file analysed: a room's decay needs more than this, s */
export const MIN_DURATION_S = 0.1
/** a file whose peak stays below this (−90 dBFS, under one 16-bit step) is treated as silence */
export const SILENCE_PEAK = 10 ** (-90 / 20)

export type WavEncoding = 'pcm16' | 'pcm24' | 'pcm32' | 'float32'
export type ChannelLabel = 'mono' | 'left' | 'right'

export interface DecodedWav {
  sampleRate: number
  encoding: WavEncoding
  durationS: number
  /** samples scaled to ±1 full scale */
  channels: { label: ChannelLabel; samples: Float64Array }[]
  warnings: MeasurementWarning[]
}

const ENCODINGS: Record<string, WavEncoding> = { '16': 'pcm16', '24': 'pcm24', '32': 'pcm32', '32f': 'float32' }
const FULL_SCALE: Record<WavEncoding, number> = { pcm16: 2 ** 15, pcm24: 2 ** 23, pcm32: 2 ** 31, float32: 1 }

function ascii(bytes: Uint8Array, at: number): string {
  return String.fromCharCode(bytes[at], bytes[at + 1], bytes[at + 2], bytes[at + 3])
}

/**
 * Decodes a WAV file (RIFF, RIFX or RF64) of 16/24/32-bit PCM or 32-bit float, mono
 * or stereo (left, right), at 44.1, 48, 88.2 or 96 kHz, up to 30 s.
 * @throws MeasurementFileError for a file that cannot be analysed
 */
export function decodeWav(bytes: Uint8Array): DecodedWav {
  if (bytes.length === 0) throw new MeasurementFileError('empty-file', 'the file is empty (0 bytes)')
  if (bytes.length < 12) {
    const head = ascii(bytes, 0)
    if (['RIFF', 'RIFX', 'RF64'].includes(head)) throw new MeasurementFileError('truncated', `the WAV file is cut short: ${bytes.length} bytes, not even a full RIFF header`)
    throw new MeasurementFileError('not-wav', 'the file is not a WAV file: it does not start with a RIFF/WAVE header')
  }
  const container = ascii(bytes, 0)
  if (!['RIFF', 'RIFX', 'RF64'].includes(container) || ascii(bytes, 8) !== 'WAVE') {
    throw new MeasurementFileError('not-wav', 'the file is not a WAV file: it does not start with a RIFF/WAVE header')
  }
  const wav = new WaveFile()
  try {
    wav.fromBuffer(bytes, true)
  } catch (err) {
    const reason = err instanceof Error ? err.message : String(err)
    if (/fmt|data|ds64/.test(reason)) throw new MeasurementFileError('truncated', `the WAV file is cut short or damaged: ${reason.replace(/^Could not find/, 'no')}`)
    throw new MeasurementFileError('not-wav', `the WAV file could not be read: ${reason}`)
  }
  const fmt = wav.fmt
  if (!fmt || !fmt.sampleRate || !fmt.numChannels || !fmt.blockAlign) {
    throw new MeasurementFileError('truncated', 'the WAV file is cut short: its format chunk is incomplete')
  }
  const encoding = ENCODINGS[wav.bitDepth]
  const isPcmOrFloat = [1, 3, 0xfffe].includes(fmt.audioFormat)
  if (!encoding || !isPcmOrFloat) {
    throw new MeasurementFileError(
      'unsupported-encoding',
      `unsupported WAV encoding: format ${fmt.audioFormat}, ${fmt.bitsPerSample}-bit; use 16, 24 or 32-bit PCM or 32-bit float`,
    )
  }
  if (!(SUPPORTED_SAMPLE_RATES as readonly number[]).includes(fmt.sampleRate)) {
    throw new MeasurementFileError('unsupported-sample-rate', `unsupported sample rate ${fmt.sampleRate} Hz; use 44.1, 48, 88.2 or 96 kHz`)
  }
  if (fmt.numChannels !== 1 && fmt.numChannels !== 2) {
    throw new MeasurementFileError('unsupported-channels', `the file has ${fmt.numChannels} channels; send mono or stereo (left, right)`)
  }
  const declared = container === 'RF64' && wav.ds64 ? (wav.ds64.dataChunkSizeHigh ?? 0) * 2 ** 32 + (wav.ds64.dataChunkSizeLow ?? 0) : wav.data.chunkSize
  const present = wav.data.samples.length
  if (declared === 0) throw new MeasurementFileError('no-samples', 'the WAV file holds no samples (its data chunk is empty)')
  if (present < declared) {
    throw new MeasurementFileError('truncated', `the WAV file is cut short: its data chunk declares ${declared} bytes but only ${present} are present`)
  }
  const frames = Math.floor(declared / fmt.blockAlign)
  const durationS = frames / fmt.sampleRate
  if (durationS > MAX_DURATION_S) throw new MeasurementFileError('too-long', `the recording lasts ${durationS.toFixed(1)} s; the limit is ${MAX_DURATION_S} s`)
  if (durationS < MIN_DURATION_S) throw new MeasurementFileError('too-short', `the recording lasts ${(durationS * 1000).toFixed(1)} ms; an impulse response needs at least ${MIN_DURATION_S * 1000} ms`)

  let decoded: Float64Array | Float64Array[]
  try {
    decoded = wav.getSamples(false, Float64Array)
  } catch (err) {
    throw new MeasurementFileError('truncated', `the WAV samples could not be decoded: ${err instanceof Error ? err.message : String(err)}`)
  }
  const raw = Array.isArray(decoded) ? decoded : [decoded]
  const scale = 1 / FULL_SCALE[encoding]
  const labels: ChannelLabel[] = fmt.numChannels === 1 ? ['mono'] : ['left', 'right']
  const warnings: MeasurementWarning[] = []
  const channels = raw.slice(0, fmt.numChannels).map((ch, c) => {
    const samples = new Float64Array(frames)
    let peak = 0
    let clippedRuns = 0
    let run = 0
    for (let i = 0; i < frames; i++) {
      const v = ch[i] * scale
      if (!Number.isFinite(v)) {
        throw new MeasurementFileError('non-finite-samples', `the ${labels[c]} channel holds a ${Number.isNaN(v) ? 'NaN' : 'infinite'} sample at ${(i / fmt.sampleRate).toFixed(4)} s (sample ${i})`)
      }
      samples[i] = v
      const a = Math.abs(v)
      if (a > peak) peak = a
      if (a >= 0.999) {
        run++
        if (run === 2) clippedRuns++
      } else run = 0
    }
    if (peak < SILENCE_PEAK) throw new MeasurementFileError('silent', `the ${labels[c]} channel is silent (peak below −90 dBFS)`)
    if (clippedRuns > 0) {
      warnings.push({ code: 'clipping', message: `the ${labels[c]} channel clips: ${clippedRuns} run(s) of consecutive samples at full scale; the analysis may be distorted` })
    }
    return { label: labels[c], samples }
  })
  return { sampleRate: fmt.sampleRate, encoding, durationS, channels, warnings }
}
