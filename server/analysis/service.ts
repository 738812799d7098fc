/**
 * Measurement analysis as a service: the file's bytes go to a worker thread, the
 * JSON-serialisable result comes back. Bad files reject with a MeasurementFileError
 * (code + message); a worker that crashes or overruns rejects with an
 * AnalysisFailedError, and the process carries on.
 */
import type Piscina from 'piscina'
import { MeasurementFileError } from '../../shared/signal/index'
import type { MeasurementAnalysisResult, MeasurementKind, PredictedReflection } from '../../shared/signal/index'
import { analysisPool } from './pool'
import type { AnalysisReply, AnalysisTask, SubwooferTask } from './worker'
import type { DiagnosisContext } from './diagnosis'
import type { SubwooferAdvice } from '../../shared/acoustics/subwoofer-advice'

export type { DiagnosisContext } from './diagnosis'

export type { MeasurementAnalysisResult } from '../../shared/signal/index'

/** The analysis did not finish: the worker crashed, ran out of memory or took too long. */
export class AnalysisFailedError extends Error {
  readonly code: 'analysis-timed-out' | 'analysis-crashed'
  constructor(code: AnalysisFailedError['code'], message: string) {
    super(message)
    this.name = 'AnalysisFailedError'
    this.code = code
  }
}

/** Longest one analysis may run, ms (a 30 s stereo file takes a few seconds at most). */
export const ANALYSIS_TIMEOUT_MS = 60_000

export interface AnalyzeFileInput {
  bytes: Uint8Array | Buffer
  fileName: string
  kind?: MeasurementKind
  predicted?: PredictedReflection[]
  diagnosis?: DiagnosisContext
}

/**
 * Parses and analyses a measurement file in the worker pool.
 * @throws MeasurementFileError when the file cannot be analysed (its code says why)
 * @throws AnalysisFailedError when the worker crashed or timed out
 */
export async function analyzeMeasurementFile(
  input: AnalyzeFileInput,
  opts: { pool?: Piscina; timeoutMs?: number } = {},
): Promise<MeasurementAnalysisResult> {
  const bytes = new Uint8Array(input.bytes) // own copy, so it can be moved to the worker
  const task: AnalysisTask = { bytes, fileName: input.fileName, kind: input.kind, predicted: input.predicted, diagnosis: input.diagnosis }
  const timeoutMs = opts.timeoutMs ?? ANALYSIS_TIMEOUT_MS
  let reply: AnalysisReply
  try {
    reply = await (opts.pool ?? analysisPool()).run(task, { transferList: [bytes.buffer], signal: AbortSignal.timeout(timeoutMs) })
  } catch (err) {
    const e = err as { name?: string; code?: string; message?: string }
    if (e?.name === 'AbortError' || e?.name === 'TimeoutError') {
      throw new AnalysisFailedError('analysis-timed-out', `the analysis of "${input.fileName}" took longer than ${timeoutMs / 1000} s and was stopped`)
    }
    throw new AnalysisFailedError('analysis-crashed', `the analysis of "${input.fileName}" failed: ${e?.code ? `${e.code}: ` : ''}${e?.message ?? String(err)}`)
  }
  if (!reply.ok) throw new MeasurementFileError(reply.error.code, reply.error.message, { row: reply.error.row })
  return reply.result
}

export interface AnalysisJobDeps {
  loadFile(fileId: string): Promise<{ bytes: Uint8Array | Buffer; fileName: string; kind?: MeasurementKind; predicted?: PredictedReflection[]; diagnosis?: DiagnosisContext }>
  saveResult(fileId: string, result: MeasurementAnalysisResult): Promise<void>
  /** reason: a sentence for the listener and advisor; details.code: the machine code */
  saveFailure(fileId: string, reason: string, details?: { code: string }): Promise<void>
}

export type AnalysisJobOutcome = { status: 'analysed' } | { status: 'rejected'; code: string; reason: string }

/**
 * Job handler for "analyse this uploaded file". A file that cannot be analysed is
 * recorded as a failure and the job completes (retrying cannot help). A crash or
 * time-out is recorded too, then rethrown so the queue marks the job failed with the
 * reason. Errors loading the file propagate untouched (transient: let the queue retry).
 */
export async function handleAnalysisJob(
  job: { data: { fileId: string } },
  deps: AnalysisJobDeps,
  opts: { pool?: Piscina; timeoutMs?: number } = {},
): Promise<AnalysisJobOutcome> {
  const { fileId } = job.data
  const file = await deps.loadFile(fileId)
  let result: MeasurementAnalysisResult
  try {
    result = await analyzeMeasurementFile(file, opts)
  } catch (err) {
    if (err instanceof MeasurementFileError || err instanceof AnalysisFailedError) {
      await deps.saveFailure(fileId, err.message, { code: err.code })
      if (err instanceof AnalysisFailedError) throw err
      return { status: 'rejected', code: err.code, reason: err.message }
    }
    throw err
  }
  await deps.saveResult(fileId, result)
  return { status: 'analysed' }
}

/** Longest a subwoofer search may run, ms (a four-subwoofer search of a typical room takes about a second). */
export const SUBWOOFER_SEARCH_TIMEOUT_MS = 20_000

/**
 * The subwoofer search in the worker pool (never on the request thread).
 * @throws AnalysisFailedError when the worker crashed or timed out
 */
export async function runSubwooferSearch(task: SubwooferTask, opts: { pool?: Piscina; timeoutMs?: number } = {}): Promise<SubwooferAdvice> {
  const timeoutMs = opts.timeoutMs ?? SUBWOOFER_SEARCH_TIMEOUT_MS
  try {
    return await (opts.pool ?? analysisPool()).run(task, { name: 'subwooferSearch', signal: AbortSignal.timeout(timeoutMs) })
  } catch (err) {
    const e = err as { name?: string; message?: string }
    if (e?.name === 'AbortError' || e?.name === 'TimeoutError') throw new AnalysisFailedError('analysis-timed-out', `the subwoofer search took longer than ${timeoutMs / 1000} s and was stopped`)
    if (err instanceof Error && /RangeError/.test(err.name)) throw err
    throw new AnalysisFailedError('analysis-crashed', `the subwoofer search failed: ${e?.message ?? String(err)}`)
  }
}
