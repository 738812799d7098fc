/**
 * The low-frequency diagnosis of a measurement, added to its analysis where the case's room is known:
 * each measured peak explained by a mode of the stated room, a boundary dip or nothing
 * (explainLowFrequencyPeaks), per channel of an impulse response, or for a frequency-response file.
 */
import { decodeWav, explainLowFrequencyPeaks, parseFrequencyResponseBytes } from '../../shared/signal/index'
import type { MeasurementAnalysisResult, SourcedLowFrequencyDiagnosis } from '../../shared/signal/index'
import type { Point, RoomBox } from '../../shared/acoustics/index'

export interface DiagnosisContext {
  room: RoomBox
  celsius?: number
  /** the main seat */
  seat: Point
  /** the bass sources by role: the left and right speakers, the first subwoofer when the room has one */
  left: Point
  right: Point
  subwoofer?: Point
}

type StoredDiagnosis = SourcedLowFrequencyDiagnosis

function sourceFor(ctx: DiagnosisContext, channel: string): { source: StoredDiagnosis['source']; sourcePoint: Point } {
  if (ctx.subwoofer) return { source: 'subwoofer', sourcePoint: ctx.subwoofer }
  return channel === 'right' ? { source: 'right', sourcePoint: ctx.right } : { source: 'left', sourcePoint: ctx.left }
}

function diagnose(measured: Parameters<typeof explainLowFrequencyPeaks>[0], ctx: DiagnosisContext, channel: string): StoredDiagnosis | null {
  const s = sourceFor(ctx, channel)
  try {
    return { ...explainLowFrequencyPeaks(measured, ctx.room, s.sourcePoint, ctx.seat, { celsius: ctx.celsius }), ...s }
  } catch (err) {
    if (err instanceof RangeError) return null // e.g. a frequency response that does not reach 20–200 Hz
    throw err
  }
}

export function attachLowFrequencyDiagnosis(bytes: Uint8Array, result: MeasurementAnalysisResult, ctx: DiagnosisContext): MeasurementAnalysisResult {
  if (result.kind === 'impulse-response') {
    const wav = decodeWav(bytes)
    return {
      ...result,
      channels: result.channels.map((ch, i) => ({ ...ch, lowFrequencyDiagnosis: diagnose({ samples: wav.channels[i].samples, sampleRate: wav.sampleRate }, ctx, ch.label) })),
    }
  }
  const points = parseFrequencyResponseBytes(bytes)
  return { ...result, lowFrequencyDiagnosis: diagnose({ freqsHz: points.freqsHz, splDb: points.splDb }, ctx, 'mono') }
}
