import { defineQueue, registerWorker } from '../jobs/queue'
import { findFile, setAnalysis } from '../data/files'
import { insertEvent } from '../data/events'
import { storage } from '../storage'
import { handleAnalysisJob } from '../analysis/service'
import type { PredictedReflection } from '../../shared/signal/index'
import { latestTriage } from './triage'
import { publishCase } from './live'

export const ANALYSE_MEASUREMENT = 'analyse-measurement'

/**
 * Measurement analysis runs as a job: a crash or time-out is retried a few times with backoff;
 * a file that cannot be analysed is recorded with its reason at once.
 */
defineQueue(ANALYSE_MEASUREMENT, { retryLimit: 3, retryDelay: 5, retryBackoff: true, expireInSeconds: 300 })

/** The case's predicted first-order reflections (main seat, first speaker), to name measured peaks by surface. */
async function predictedFor(caseId: string): Promise<PredictedReflection[] | undefined> {
  const triage = await latestTriage(caseId)
  const list = (triage?.reflections ?? []) as { surface: string; delayMs: number; levelDb: number; speaker?: string; seat?: string; order?: number }[]
  if (!list.length) return undefined
  const speaker = list[0].speaker
  const seat = list[0].seat
  return list
    .filter((r) => r.speaker === speaker && r.seat === seat && (r.order === undefined || r.order === 1))
    .map((r) => ({ surface: r.surface, delayMs: r.delayMs, levelDb: r.levelDb })) as PredictedReflection[]
}

async function after(fileId: string, status: string) {
  const f = await findFile(fileId)
  if (!f) return
  const seq = await insertEvent({ caseId: f.caseId, actorId: null, kind: 'analysis', data: { fileId, status, name: f.originalName, reason: f.analysisError } })
  publishCase(f.caseId, { type: 'case.analysis', caseId: f.caseId, fileId, status })
  publishCase(f.caseId, { type: 'case.event', caseId: f.caseId, seq, kind: 'analysis' })
}

export async function runAnalysisJob(job: { data: { fileId: string } }) {
  await handleAnalysisJob(job, {
    loadFile: async (fileId) => {
      const f = await findFile(fileId)
      if (!f) throw new Error(`file ${fileId} no longer exists`)
      await setAnalysis(fileId, 'running', null, null)
      return { bytes: await storage().getBuffer(f.storageKey), fileName: f.originalName, predicted: await predictedFor(f.caseId) }
    },
    saveResult: async (fileId, result) => {
      await setAnalysis(fileId, 'done', result, null)
      await after(fileId, 'done')
    },
    saveFailure: async (fileId, reason) => {
      await setAnalysis(fileId, 'failed', null, reason)
      await after(fileId, 'failed')
    },
  })
}

registerWorker<{ fileId: string }>(ANALYSE_MEASUREMENT, runAnalysisJob)
