import type { Transaction } from 'sequelize'
import { models, type FileModel } from '../db/models'
import type { Audience } from './visibility'
import type { AnalysisStatus } from '../db/models/file'
import type { CaseFile, FileKind } from '../../shared/schemas/case'

export type { FileModel }

export const toCaseFile = (r: FileModel, withResult = true): CaseFile => ({
  id: r.id,
  caseId: r.caseId,
  kind: r.kind,
  name: r.originalName,
  mime: r.mime,
  size: Number(r.size),
  createdAt: r.createdAt.toISOString(),
  uploaderId: r.uploaderId ?? '',
  hasThumbnail: !!r.thumbKey,
  analysis: r.analysisStatus ? { status: r.analysisStatus, error: r.analysisError ?? null, ...(withResult ? { result: r.analysis ?? null } : {}) } : null,
})

export async function insertFile(f: { caseId: string; uploaderId: string; kind: FileKind; name: string; mime: string; size: number; storageKey: string; thumbKey: string | null; analysisStatus: 'queued' | null }, t: Transaction): Promise<FileModel> {
  const { name, ...rest } = f
  return models().File.create({ ...rest, originalName: name }, { transaction: t })
}

/** A file by id; with `audience`, only when that audience may see it (scope `visibleTo`, the rule of ./visibility.ts). */
export async function findFile(id: string, audience: Audience = 'team'): Promise<FileModel | null> {
  return models().File.scope({ method: ['visibleTo', audience] }).findOne({ where: { id } })
}

/** The case's files as `audience` may see them, oldest first. */
export async function listFiles(caseId: string, audience: Audience): Promise<FileModel[]> {
  return models().File.scope({ method: ['visibleTo', audience] }).findAll({ where: { caseId }, order: [['createdAt', 'ASC'], ['id', 'ASC']] })
}

/** How many measurements and photos the case holds (they weigh in its triage score). */
export async function countEvidence(caseId: string, t?: Transaction): Promise<{ measurements: number; photos: number }> {
  const File = models().File
  const [measurements, photos] = await Promise.all([
    File.count({ where: { caseId, kind: 'measurement' }, transaction: t }),
    File.count({ where: { caseId, kind: 'photo' }, transaction: t }),
  ])
  return { measurements, photos }
}

export async function setAnalysis(id: string, status: AnalysisStatus, result: unknown, error: string | null, t?: Transaction): Promise<FileModel | null> {
  const File = models().File
  await File.update({ analysisStatus: status, analysisError: error, ...(result === null ? {} : { analysis: result }) }, { where: { id }, transaction: t })
  return File.findByPk(id, { transaction: t })
}
