/**
 * A whole measurement file, from bytes to a JSON-serialisable result: WAV impulse
 * responses (each channel analysed, stereo compared left against right) and
 * frequency-response text files.
 */
import { analyzeMeasurement, lowFrequencySummary, type MeasurementAnalysis, type MeasurementOptions } from './analyze'
import { compareLeftRight, type LeftRightComparison } from './compare'
import { MeasurementFileError, type MeasurementWarning } from './errors'
import { parseFrequencyResponseBytes } from './frequency-response'
import { smoothedResponse, spectrumFromPoints, type SmoothedResponse, type SpectralExtremum } from './spectrum'
import { decodeWav, type ChannelLabel, type WavEncoding } from './wav'
import type { SourcedLowFrequencyDiagnosis } from './low-frequency-peaks'

export type MeasurementKind = 'impulse-response' | 'frequency-response'

export interface ImpulseResponseFileAnalysis {
  kind: 'impulse-response'
  sampleRate: number
  encoding: WavEncoding
  durationS: number
  /** lowFrequencyDiagnosis: added by the server where the case's room is known (null: the diagnosis could not be made) */
  channels: (MeasurementAnalysis & { label: ChannelLabel; lowFrequencyDiagnosis?: SourcedLowFrequencyDiagnosis | null })[]
  /** stereo files only: left − right per one-third-octave band */
  leftRight: LeftRightComparison | null
  warnings: MeasurementWarning[]
}

export interface FrequencyResponseFileAnalysis {
  kind: 'frequency-response'
  pointCount: number
  minHz: number
  maxHz: number
  hasPhase: boolean
  /** the file's curve smoothed 1/1 … 1/24 octave on a 24-per-octave grid within its own range */
  response: SmoothedResponse
  lowFrequency: { peaks: SpectralExtremum[]; nulls: SpectralExtremum[]; spreadDb: number } | null
  /** added by the server where the case's room is known */
  lowFrequencyDiagnosis?: SourcedLowFrequencyDiagnosis | null
  warnings: MeasurementWarning[]
}

export type MeasurementAnalysisResult = ImpulseResponseFileAnalysis | FrequencyResponseFileAnalysis

/** Impulse response or frequency response, from the stated kind, the file name or the first bytes. */
export function detectKind(bytes: Uint8Array, fileName = '', kind?: MeasurementKind): MeasurementKind {
  if (kind) return kind
  if (/\.(wav|wave)$/i.test(fileName)) return 'impulse-response'
  if (/\.(txt|csv|tsv|frd|dat)$/i.test(fileName)) return 'frequency-response'
  const head = String.fromCharCode(...bytes.subarray(0, 4))
  if (['RIFF', 'RIFX', 'RF64'].includes(head)) return 'impulse-response'
  if (bytes.length === 0) throw new MeasurementFileError('empty-file', 'the file is empty (0 bytes)')
  throw new MeasurementFileError('unknown-kind', `cannot tell what "${fileName}" holds: send a .wav impulse response or a .txt/.csv frequency response`)
}

export function analyzeImpulseResponseFile(bytes: Uint8Array, opts: MeasurementOptions = {}): ImpulseResponseFileAnalysis {
  const wav = decodeWav(bytes)
  const channels = wav.channels.map((ch) => ({ label: ch.label, ...analyzeMeasurement(ch.samples, wav.sampleRate, opts) }))
  const left = channels.find((c) => c.label === 'left')
  const right = channels.find((c) => c.label === 'right')
  return {
    kind: 'impulse-response',
    sampleRate: wav.sampleRate,
    encoding: wav.encoding,
    durationS: wav.durationS,
    channels,
    leftRight: left && right ? compareLeftRight(left, right) : null,
    warnings: [...wav.warnings, ...channels.flatMap((c) => c.warnings.map((w) => ({ ...w, message: `${c.label}: ${w.message}` })))],
  }
}

export function analyzeFrequencyResponseFile(bytes: Uint8Array): FrequencyResponseFileAnalysis {
  const points = parseFrequencyResponseBytes(bytes)
  const minHz = points.freqsHz[0]
  const maxHz = points.freqsHz[points.freqsHz.length - 1]
  const binHz = Math.min(0.5, minHz / 40)
  const spec = spectrumFromPoints(points.freqsHz, points.splDb, binHz)
  const lfTop = Math.min(300, maxHz)
  return {
    kind: 'frequency-response',
    pointCount: points.freqsHz.length,
    minHz,
    maxHz,
    hasPhase: points.phaseDeg !== undefined,
    response: smoothedResponse(spec, minHz, maxHz, 24),
    lowFrequency: lfTop > minHz * 1.5 ? lowFrequencySummary(spec, minHz, lfTop) : null,
    warnings: [],
  }
}

/**
 * Analyses a measurement file of either kind.
 * @throws MeasurementFileError for a file that cannot be analysed
 */
export function analyzeMeasurementBytes(
  bytes: Uint8Array,
  opts: MeasurementOptions & { fileName?: string; kind?: MeasurementKind } = {},
): MeasurementAnalysisResult {
  const kind = detectKind(bytes, opts.fileName, opts.kind)
  return kind === 'impulse-response' ? analyzeImpulseResponseFile(bytes, opts) : analyzeFrequencyResponseFile(bytes)
}
