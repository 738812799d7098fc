import { insertEvent } from '../data/events'
import { findFile, insertFile, listFiles, setAnalysis, toCaseFile, type FileModel } from '../data/files'
import { touchActivity } from '../data/cases'
import { withTransaction } from '../db/transaction'
import { conflict, notFound } from '../errors'
import { storage } from '../storage'
import { randomUUID } from 'node:crypto'
import { discardUpload, finaliseUpload, makeThumbnail, type UploadedFile } from '../uploads'
import { enqueue } from '../jobs/queue'
import type { CaseFile } from '../../shared/schemas/case'
import type { User } from '../../shared/schemas/auth'
import { audienceOf, isStaff, readableCase } from './access'
import { fileIsTeamOnly } from '../data/visibility'
import { publishCase, publishQueue } from './live'
import { ANALYSE_MEASUREMENT } from './measurements'
import { refreshScore } from './triage'

/**
 * Stores an upload on a case: the file row, its thumbnail and (for measurements) the analysis job are
 * written together; if anything fails, the stored bytes are removed again so nothing is half-stored.
 */
export async function checkCaseAcceptsFiles(user: User, caseId: string) {
  const c = await readableCase(user, caseId)
  if (c.status === 'closed') throw conflict('This case is closed; reopen it to add files', 'closed')
  return c
}

export async function addCaseFile(user: User, caseId: string, upload: UploadedFile): Promise<CaseFile> {
  let thumbKey: string | null = null
  const finalKey = `cases/${caseId}/${randomUUID()}.${upload.key.split('.').pop()}`
  let key = upload.key
  try {
    await checkCaseAcceptsFiles(user, caseId)
    await finaliseUpload(upload.key, finalKey)
    key = finalKey
    if (upload.kind === 'photo') thumbKey = await makeThumbnail(key)
    const row = await withTransaction(async (t, afterCommit) => {
      const row = await insertFile({
        caseId, uploaderId: user.id, kind: upload.kind, name: upload.originalname, mime: upload.mime, size: upload.size,
        storageKey: key, thumbKey, analysisStatus: upload.kind === 'measurement' ? 'queued' : null,
      }, t)
      const seq = await insertEvent({ caseId, actorId: user.id, kind: 'file', data: { fileId: row.id, name: row.originalName, fileKind: row.kind } }, t)
      if (upload.kind === 'measurement') await enqueue(ANALYSE_MEASUREMENT, { fileId: row.id }, { transaction: t })
      // A file the team uploads stays with the team until it goes out with a reply (server/data/visibility.ts).
      const internal = await fileIsTeamOnly(row.id, t)
      await touchActivity(caseId, t)
      await refreshScore(caseId, t)
      afterCommit(() => {
        publishCase(caseId, { type: 'case.event', caseId, seq, kind: 'file', ...(internal ? { internal } : {}) }, { internal })
        publishQueue(caseId)
      })
      return row
    })
    return toCaseFile(row)
  } catch (e) {
    await discardUpload(key).catch(() => {})
    if (thumbKey) await discardUpload(thumbKey).catch(() => {})
    throw e
  }
}

export async function caseFiles(user: User, caseId: string): Promise<CaseFile[]> {
  await readableCase(user, caseId)
  return (await listFiles(caseId, audienceOf(user))).map((r) => toCaseFile(r))
}

/** A file for download: only for those who may read its case, and only when the file is shared with them (others: 404). */
export async function readableFile(user: User, fileId: string): Promise<FileModel> {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(fileId)) throw notFound('That file')
  const f = await findFile(fileId)
  if (!f) throw notFound('That file')
  await readableCase(user, f.caseId)
  if (audienceOf(user) !== 'team' && !(await findFile(fileId, audienceOf(user)))) throw notFound('That file')
  return f
}

export async function openFile(user: User, fileId: string, variant: 'original' | 'thumbnail') {
  const f = await readableFile(user, fileId)
  const key = variant === 'thumbnail' ? f.thumbKey : f.storageKey
  if (!key) throw notFound('A thumbnail for that file')
  return { row: f, stream: await storage().get(key), mime: variant === 'thumbnail' ? 'image/webp' : f.mime }
}

/** Lets the team re-run an analysis (e.g. after the engine improved). */
export async function requeueAnalysis(user: User, fileId: string): Promise<CaseFile> {
  const f = await readableFile(user, fileId)
  if (!isStaff(user) || f.kind !== 'measurement') throw notFound('That measurement')
  await withTransaction(async (t) => {
    await setAnalysis(fileId, 'queued', null, null, t)
    await enqueue(ANALYSE_MEASUREMENT, { fileId }, { transaction: t })
  })
  return toCaseFile((await findFile(fileId))!)
}

export { setAnalysis }
