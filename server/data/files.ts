import { QueryTypes, type Transaction } from 'sequelize'
import { db } from '../db/sequelize'
import { visibleTo, type Audience } from './visibility'
import type { CaseFile, FileKind } from '../../shared/schemas/case'

export interface FileRow {
  id: string; case_id: string; uploader_id: string | null; message_id: string | null; kind: FileKind; original_name: string; mime: string
  size: string | number; storage_key: string; thumb_key: string | null; analysis_status: 'queued' | 'running' | 'done' | 'failed' | null
  analysis: unknown; analysis_error: string | null; created_at: Date
}

export const toCaseFile = (r: FileRow, withResult = true): CaseFile => ({
  id: r.id,
  caseId: r.case_id,
  kind: r.kind,
  name: r.original_name,
  mime: r.mime,
  size: Number(r.size),
  createdAt: new Date(r.created_at).toISOString(),
  uploaderId: r.uploader_id ?? '',
  hasThumbnail: !!r.thumb_key,
  analysis: r.analysis_status ? { status: r.analysis_status, error: r.analysis_error, ...(withResult ? { result: r.analysis ?? null } : {}) } : null,
})

export async function insertFile(f: { caseId: string; uploaderId: string; kind: FileKind; name: string; mime: string; size: number; storageKey: string; thumbKey: string | null; analysisStatus: 'queued' | null }, t: Transaction): Promise<FileRow> {
  const [row] = await db().query<FileRow>(
    `INSERT INTO files (case_id, uploader_id, kind, original_name, mime, size, storage_key, thumb_key, analysis_status)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9) RETURNING *`,
    { bind: [f.caseId, f.uploaderId, f.kind, f.name, f.mime, f.size, f.storageKey, f.thumbKey, f.analysisStatus], type: QueryTypes.SELECT, transaction: t },
  )
  return row
}

/** A file by id; with `audience`, only when that audience may see it (./visibility.ts). */
export async function findFile(id: string, audience: Audience = 'team'): Promise<FileRow | null> {
  const rows = await db().query<FileRow>(`SELECT f.* FROM files f WHERE f.id = $1 AND ${visibleTo(audience, 'file', 'f')}`, { bind: [id], type: QueryTypes.SELECT })
  return rows[0] ?? null
}

/** The case's files as `audience` may see them (./visibility.ts). */
export async function listFiles(caseId: string, audience: Audience): Promise<FileRow[]> {
  return db().query<FileRow>(`SELECT f.* FROM files f WHERE f.case_id = $1 AND ${visibleTo(audience, 'file', 'f')} ORDER BY f.created_at, f.id`, { bind: [caseId], type: QueryTypes.SELECT })
}

export async function setAnalysis(id: string, status: 'running' | 'done' | 'failed', result: unknown, error: string | null): Promise<FileRow | null> {
  const rows = await db().query<FileRow>(
    'UPDATE files SET analysis_status = $2, analysis = COALESCE($3::jsonb, analysis), analysis_error = $4 WHERE id = $1 RETURNING *',
    { bind: [id, status, result === null ? null : JSON.stringify(result), error], type: QueryTypes.SELECT },
  )
  return rows[0] ?? null
}
