import { QueryTypes, type Transaction } from 'sequelize'
import { db } from '../db/sequelize'
import type { PlanBody, PlanVersion } from '../../shared/schemas/plan'
import type { PlanPredictions } from '../../shared/plan'

interface Row {
  case_id: string; version: number; room_id: string; room_revision: number; body: PlanBody; predictions: PlanPredictions; engine_version: string
  created_by: string | null; creator_name: string | null; created_at: Date; sent_at: Date | null; sent_by: string | null; sender_name: string | null
}

const toVersion = (r: Row): PlanVersion => ({
  caseId: r.case_id,
  version: r.version,
  status: r.sent_at ? 'sent' : 'draft',
  roomId: r.room_id,
  roomRevision: r.room_revision,
  body: r.body,
  predictions: r.predictions,
  engineVersion: r.engine_version,
  createdBy: r.created_by ? { id: r.created_by, name: r.creator_name ?? '' } : null,
  createdAt: new Date(r.created_at).toISOString(),
  sentAt: r.sent_at ? new Date(r.sent_at).toISOString() : null,
  sentBy: r.sent_by ? { id: r.sent_by, name: r.sender_name ?? '' } : null,
})

const select = `
  SELECT p.case_id, p.version, p.room_id, p.room_revision, p.body, p.predictions, p.engine_version,
         p.created_by, c.name AS creator_name, p.created_at, p.sent_at, p.sent_by, s.name AS sender_name
    FROM treatment_plans p
    LEFT JOIN users c ON c.id = p.created_by
    LEFT JOIN users s ON s.id = p.sent_by`

/** Versions of a case's plan, newest first; `sentOnly` leaves drafts out. */
export async function listPlanVersions(caseId: string, sentOnly: boolean, t?: Transaction): Promise<PlanVersion[]> {
  const rows = await db().query<Row>(`${select} WHERE p.case_id = $1 ${sentOnly ? 'AND p.sent_at IS NOT NULL' : ''} ORDER BY p.version DESC`, {
    bind: [caseId], type: QueryTypes.SELECT, transaction: t,
  })
  return rows.map(toVersion)
}

export async function findPlanVersion(caseId: string, version: number, t?: Transaction): Promise<PlanVersion | null> {
  const rows = await db().query<Row>(`${select} WHERE p.case_id = $1 AND p.version = $2`, { bind: [caseId, version], type: QueryTypes.SELECT, transaction: t })
  return rows[0] ? toVersion(rows[0]) : null
}

/** Stores the next version number of the case's plan; the case row lock keeps two saves from taking the same number. */
export async function insertPlanVersion(
  input: { caseId: string; roomId: string; roomRevision: number; body: PlanBody; predictions: PlanPredictions; engineVersion: string; createdBy: string },
  t: Transaction,
): Promise<number> {
  await db().query('SELECT id FROM cases WHERE id = $1 FOR UPDATE', { bind: [input.caseId], transaction: t })
  const [row] = await db().query<{ version: number }>(
    `INSERT INTO treatment_plans (case_id, version, room_id, room_revision, body, predictions, engine_version, created_by)
     VALUES ($1, (SELECT COALESCE(MAX(version), 0) + 1 FROM treatment_plans WHERE case_id = $1), $2, $3, $4, $5, $6, $7)
     RETURNING version`,
    {
      bind: [input.caseId, input.roomId, input.roomRevision, JSON.stringify(input.body), JSON.stringify(input.predictions), input.engineVersion, input.createdBy],
      type: QueryTypes.SELECT, transaction: t,
    },
  )
  return Number(row.version)
}

/** Stamps a version as sent; false when it was sent already (someone else got there first). */
export async function markPlanSent(caseId: string, version: number, userId: string, t: Transaction): Promise<boolean> {
  const rows = await db().query<{ version: number }>(
    'UPDATE treatment_plans SET sent_at = now(), sent_by = $3 WHERE case_id = $1 AND version = $2 AND sent_at IS NULL RETURNING version',
    { bind: [caseId, version, userId], type: QueryTypes.SELECT, transaction: t },
  )
  return rows.length === 1
}
