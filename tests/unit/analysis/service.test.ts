import { afterAll, describe, expect, it } from 'vitest'
import { createAnalysisPool } from '../../../server/analysis/pool'
import { AnalysisFailedError, analyzeMeasurementFile, handleAnalysisJob, type AnalysisJobDeps } from '../../../server/analysis/service'
import { MeasurementFileError, type ImpulseResponseFileAnalysis, type MeasurementAnalysisResult } from '../../../shared/signal/index'
import { addPulse, exponentialDecay, writeWav } from '../signal/synthetic'

const fs = 48000
function wavBytes(seconds = 1): Uint8Array {
  const x = exponentialDecay({ rt: 0.35, sampleRate: fs, seconds, seed: 2, startIndex: 200 })
  for (let i = 0; i < x.length; i++) x[i] *= 0.05
  addPulse(x, fs, 200 / 48, 0.9)
  return writeWav([x], fs, '24')
}

// one real piscina pool (worker threads running server/analysis/worker.ts through tsx)
const pool = createAnalysisPool({ maxThreads: 1 })
afterAll(async () => {
  await pool.destroy()
})

describe('analyzeMeasurementFile (in the worker pool)', () => {
  it('analyses a WAV impulse response in a worker thread', async () => {
    const result = (await analyzeMeasurementFile({ bytes: wavBytes(), fileName: 'seat-1.wav' }, { pool })) as ImpulseResponseFileAnalysis
    expect(result.kind).toBe('impulse-response')
    expect(result.channels).toHaveLength(1)
    expect(result.channels[0].label).toBe('mono')
    // a noise decay: single estimates scatter, least from 1 kHz up (see tests/unit/signal/decay.test.ts)
    for (const b of result.channels[0].bands.filter((b) => b.centerHz >= 1000)) expect(Math.abs(b.t20! / 0.35 - 1)).toBeLessThan(0.1)
  })

  it('accepts a Node Buffer and a frequency-response text file', async () => {
    const text = 'frequency_hz,spl_db\n' + Array.from({ length: 40 }, (_, i) => `${20 * 2 ** (i / 6)},${70 + (i % 3)}`).join('\n')
    const result = await analyzeMeasurementFile({ bytes: Buffer.from(text), fileName: 'seat-1.csv' }, { pool })
    expect(result.kind).toBe('frequency-response')
  })

  it('rejects a bad file with a MeasurementFileError carrying the code and row', async () => {
    const err = await analyzeMeasurementFile({ bytes: Buffer.from('frequency_hz,spl_db\n20,70\n10,71\n'), fileName: 'x.csv' }, { pool }).catch((e) => e)
    expect(err).toBeInstanceOf(MeasurementFileError)
    expect(err.code).toBe('text-frequency-out-of-range')
    expect(err.row).toBe(3)
    const notWav = await analyzeMeasurementFile({ bytes: new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13]), fileName: 'x.wav' }, { pool }).catch((e) => e)
    expect(notWav.code).toBe('not-wav')
  })

  it('does not let the caller’s buffer be detached by the transfer to the worker', async () => {
    const bytes = wavBytes(0.5)
    await analyzeMeasurementFile({ bytes, fileName: 'a.wav' }, { pool })
    expect(bytes.byteLength).toBeGreaterThan(0)
  })

  it('stops an analysis that overruns its time limit, and the pool keeps working', async () => {
    const err = await analyzeMeasurementFile({ bytes: wavBytes(10), fileName: 'long.wav' }, { pool, timeoutMs: 5 }).catch((e) => e)
    expect(err).toBeInstanceOf(AnalysisFailedError)
    expect(err.code).toBe('analysis-timed-out')
    const ok = await analyzeMeasurementFile({ bytes: wavBytes(0.5), fileName: 'a.wav' }, { pool })
    expect(ok.kind).toBe('impulse-response')
  })

  it('survives a worker that runs out of memory while starting: the task fails at its time limit, this process carries on', async () => {
    const starved = createAnalysisPool({ maxThreads: 1, maxOldGenerationSizeMb: 2 })
    try {
      const err = await analyzeMeasurementFile({ bytes: wavBytes(0.5), fileName: 'a.wav' }, { pool: starved, timeoutMs: 4000 }).catch((e) => e)
      // piscina keeps a task queued when its worker dies before taking it; the time limit ends it
      expect(err).toBeInstanceOf(AnalysisFailedError)
      expect(err.code).toBe('analysis-timed-out')
    } finally {
      await starved.destroy()
    }
    expect((await analyzeMeasurementFile({ bytes: wavBytes(0.5), fileName: 'a.wav' }, { pool })).kind).toBe('impulse-response')
  })
})

describe('handleAnalysisJob', () => {
  function memoryDeps(files: Record<string, { bytes: Uint8Array; fileName: string }>) {
    const saved: Record<string, MeasurementAnalysisResult> = {}
    const failed: Record<string, { reason: string; code?: string }> = {}
    const deps: AnalysisJobDeps = {
      async loadFile(id) {
        const f = files[id]
        if (!f) throw new Error(`no file ${id}`)
        return f
      },
      async saveResult(id, result) {
        saved[id] = result
      },
      async saveFailure(id, reason, details) {
        failed[id] = { reason, code: details?.code }
      },
    }
    return { deps, saved, failed }
  }

  it('stores the result of a good file', async () => {
    const { deps, saved, failed } = memoryDeps({ f1: { bytes: wavBytes(), fileName: 'seat.wav' } })
    await expect(handleAnalysisJob({ data: { fileId: 'f1' } }, deps, { pool })).resolves.toEqual({ status: 'analysed' })
    expect(saved.f1.kind).toBe('impulse-response')
    expect(failed).toEqual({})
  })

  it('records a bad file as a failure with its reason, stores no result, and completes the job', async () => {
    const silent = writeWav([new Float64Array(fs)], fs, '16')
    const { deps, saved, failed } = memoryDeps({ f2: { bytes: silent, fileName: 'seat.wav' } })
    const outcome = await handleAnalysisJob({ data: { fileId: 'f2' } }, deps, { pool })
    expect(outcome).toMatchObject({ status: 'rejected', code: 'silent' })
    expect(failed.f2.code).toBe('silent')
    expect(failed.f2.reason).toMatch(/silent/)
    expect(saved).toEqual({})
  })

  it('records a time-out as a failure and rethrows it so the queue marks the job failed', async () => {
    const { deps, saved, failed } = memoryDeps({ f3: { bytes: wavBytes(10), fileName: 'long.wav' } })
    await expect(handleAnalysisJob({ data: { fileId: 'f3' } }, deps, { pool, timeoutMs: 5 })).rejects.toBeInstanceOf(AnalysisFailedError)
    expect(failed.f3.code).toBe('analysis-timed-out')
    expect(saved).toEqual({})
  })

  it('lets a loading error propagate without recording anything (the queue may retry)', async () => {
    const { deps, saved, failed } = memoryDeps({})
    await expect(handleAnalysisJob({ data: { fileId: 'missing' } }, deps, { pool })).rejects.toThrow(/no file missing/)
    expect(saved).toEqual({})
    expect(failed).toEqual({})
  })
})
