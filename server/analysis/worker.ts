/**
 * Piscina worker: parses and analyses one measurement file (the default export), or runs one of the
 * room engine's tasks by name (the `engine` export, see engine-tasks.ts). Runs in a worker thread,
 * so a file that makes the analysis crash, hang or exhaust memory takes down only
 * this thread. Loaded through worker-bootstrap.mjs, which registers tsx.
 */
import { analyzeMeasurementBytes, MeasurementFileError } from '../../shared/signal/index'
import { runEngineTaskHere, type EngineTaskReply, type EngineTaskRequest } from './engine-tasks'
import { subwooferAdvice } from '../../shared/acoustics/subwoofer-advice'
import type { SubwooferAdvice } from '../../shared/acoustics/subwoofer-advice'
import type { RoomDescription } from '../../shared/acoustics/triage'
import { attachLowFrequencyDiagnosis, type DiagnosisContext } from './diagnosis'
import type { MeasurementAnalysisResult, MeasurementErrorCode, MeasurementKind, PredictedReflection } from '../../shared/signal/index'

export interface AnalysisTask {
  bytes: Uint8Array
  fileName: string
  kind?: MeasurementKind
  predicted?: PredictedReflection[]
  /** the case's room, speaker and main seat: the low-frequency peaks are explained when given */
  diagnosis?: DiagnosisContext
}

export type AnalysisReply =
  | { ok: true; result: MeasurementAnalysisResult }
  | { ok: false; error: { code: MeasurementErrorCode; message: string; row?: number } }

// A MeasurementFileError is answered as data: its class and code would not survive the thread boundary as a thrown error.
export default function analyzeTask(task: AnalysisTask): AnalysisReply {
  try {
    const result = analyzeMeasurementBytes(task.bytes, { fileName: task.fileName, kind: task.kind, predicted: task.predicted })
    return { ok: true, result: task.diagnosis ? attachLowFrequencyDiagnosis(task.bytes, result, task.diagnosis) : result }
  } catch (err) {
    if (err instanceof MeasurementFileError) return { ok: false, error: err.toJSON() }
    throw err
  }
}

/** One engine task (room analysis, plan predictions …) by name: `pool.run(req, { name: 'engine' })`. */
export function engine(req: EngineTaskRequest): EngineTaskReply {
  return runEngineTaskHere(req)
}

export interface SubwooferTask {
  room: RoomDescription
  counts?: number[]
}

/** The subwoofer search for a room (named task `subwooferSearch`): seconds of arithmetic kept off the request thread. */
export function subwooferSearch(task: SubwooferTask): SubwooferAdvice {
  return subwooferAdvice(task.room, { counts: task.counts })
}
