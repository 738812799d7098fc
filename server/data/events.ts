import { Op, type Transaction } from 'sequelize'
import { models } from '../db/models'
import type { Audience } from './visibility'
import type { CaseEvent, CaseStatus } from '../../shared/schemas/case'

export async function insertEvent(
  e: { caseId: string; actorId: string | null; kind: string; fromStatus?: CaseStatus | null; toStatus?: CaseStatus | null; data?: object },
  t?: Transaction,
): Promise<number> {
  const row = await models().CaseEvent.create(
    { caseId: e.caseId, actorId: e.actorId, kind: e.kind, fromStatus: e.fromStatus ?? null, toStatus: e.toStatus ?? null, data: (e.data ?? {}) as Record<string, unknown> },
    { transaction: t },
  )
  return Number(row.id)
}

/** The case's history as `audience` may see it (scope `visibleTo`, the rule of ./visibility.ts), oldest first; `afterId` for catching up after a reconnect. */
export async function listEvents(caseId: string, opts: { afterId?: number; audience: Audience }): Promise<(CaseEvent & { seq: number })[]> {
  const rows = await models()
    .CaseEvent.scope(['withActor', { method: ['visibleTo', opts.audience] }])
    .findAll({ where: { caseId, id: { [Op.gt]: opts.afterId ?? 0 } }, order: [['id', 'ASC']] })
  return rows.map((r) => ({
    id: String(r.id), seq: Number(r.id), kind: r.kind,
    actor: r.actorId ? { id: r.actorId, name: r.actor?.name ?? '' } : null,
    fromStatus: r.fromStatus, toStatus: r.toStatus, data: r.data, createdAt: r.createdAt.toISOString(),
  }))
}
