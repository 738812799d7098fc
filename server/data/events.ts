import { QueryTypes, type Transaction } from 'sequelize'
import { db } from '../db/sequelize'
import { visibleTo, type Audience } from './visibility'
import type { CaseEvent, CaseStatus } from '../../shared/schemas/case'

export async function insertEvent(
  e: { caseId: string; actorId: string | null; kind: string; fromStatus?: CaseStatus | null; toStatus?: CaseStatus | null; data?: object },
  t?: Transaction,
): Promise<number> {
  const [row] = await db().query<{ id: string }>(
    `INSERT INTO case_events (case_id, actor_id, kind, from_status, to_status, data) VALUES ($1, $2, $3, $4, $5, $6) RETURNING id`,
    { bind: [e.caseId, e.actorId, e.kind, e.fromStatus ?? null, e.toStatus ?? null, JSON.stringify(e.data ?? {})], type: QueryTypes.SELECT, transaction: t },
  )
  return Number(row.id)
}

/** The case's history as `audience` may see it (./visibility.ts), oldest first; `afterId` for catching up after a reconnect. */
export async function listEvents(caseId: string, opts: { afterId?: number; audience: Audience }): Promise<(CaseEvent & { seq: number })[]> {
  const rows = await db().query<{ id: string; kind: string; actor_id: string | null; actor_name: string | null; from_status: CaseStatus | null; to_status: CaseStatus | null; data: Record<string, unknown>; created_at: Date }>(
    `SELECT e.id, e.kind, e.actor_id, u.name AS actor_name, e.from_status, e.to_status, e.data, e.created_at
       FROM case_events e LEFT JOIN users u ON u.id = e.actor_id
      WHERE e.case_id = $1 AND e.id > $2 AND ${visibleTo(opts.audience, 'event', 'e')}
      ORDER BY e.id`,
    { bind: [caseId, opts.afterId ?? 0], type: QueryTypes.SELECT },
  )
  return rows.map((r) => ({
    id: String(r.id), seq: Number(r.id), kind: r.kind,
    actor: r.actor_id ? { id: r.actor_id, name: r.actor_name ?? '' } : null,
    fromStatus: r.from_status, toStatus: r.to_status, data: r.data, createdAt: new Date(r.created_at).toISOString(),
  }))
}
