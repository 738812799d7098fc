import { defineQueue, registerWorker } from '../jobs/queue'
import { findFile, setAnalysis } from '../data/files'
import { insertEvent } from '../data/events'
import { storage } from '../storage'
import { handleAnalysisJob } from '../analysis/service'
import type { PredictedReflection } from '../../shared/signal/index'
import { latestTriage } from './triage'
import { findCase } from '../data/cases'
import { findRoom } from '../data/rooms'
import type { DiagnosisContext } from '../analysis/service'
import { publishCase } from './live'
import { fileIsTeamOnly } from '../data/visibility'

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

/**
 * The case's room as the listener stated it, its main seat and bass sources, so the analysis can
 * explain the measured low-frequency peaks (undefined: no room found).
 */
async function diagnosisFor(caseId: string): Promise<DiagnosisContext | undefined> {
  const c = await findCase(caseId)
  if (!c) return undefined
  const rec = await findRoom(c.room.id, c.room.revision)
  if (!rec) return undefined
  const r = rec.room
  const pt = (p: { x: number; y: number; z: number }) => ({ x: p.x, y: p.y, z: p.z })
  const bySide = [...r.speakers].sort((a, b) => a.y - b.y)
  return {
    room: { length: r.length, width: r.width, height: r.height },
    celsius: r.celsius,
    seat: pt(r.seats[0]),
    left: pt(bySide[0]),
    right: pt(bySide[bySide.length - 1]),
    subwoofer: r.subwoofers.length ? pt(r.subwoofers[0]) : undefined,
  }
}

async function after(fileId: string, status: string) {
  const f = await findFile(fileId)
  if (!f) return
  const seq = await insertEvent({ caseId: f.caseId, actorId: null, kind: 'analysis', data: { fileId, status, name: f.originalName, reason: f.analysisError } })
  // An analysis of a file the listener may not see is news for the team only (server/data/visibility.ts).
  const internal = await fileIsTeamOnly(fileId)
  publishCase(f.caseId, { type: 'case.analysis', caseId: f.caseId, fileId, status }, { internal })
  publishCase(f.caseId, { type: 'case.event', caseId: f.caseId, seq, kind: 'analysis', ...(internal ? { internal } : {}) }, { internal })
}

export async function runAnalysisJob(job: { data: { fileId: string } }) {
  await handleAnalysisJob(job, {
    loadFile: async (fileId) => {
      const f = await findFile(fileId)
      if (!f) throw new Error(`file ${fileId} no longer exists`)
      await setAnalysis(fileId, 'running', null, null)
      return {
        bytes: await storage().getBuffer(f.storageKey),
        fileName: f.originalName,
        predicted: await predictedFor(f.caseId),
        diagnosis: await diagnosisFor(f.caseId),
      }
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
