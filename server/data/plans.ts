import { fn, col, type Transaction } from 'sequelize'
import { models, type TreatmentPlanModel } from '../db/models'
import { dbNow } from '../db/models/now'
import type { PlanBody, PlanVersion } from '../../shared/schemas/plan'
import type { PlanPredictions } from '../../shared/plan'

const toVersion = (r: TreatmentPlanModel): PlanVersion => ({
  caseId: r.caseId,
  version: r.version,
  status: r.sentAt ? 'sent' : 'draft',
  roomId: r.roomId,
  roomRevision: r.roomRevision,
  body: r.body,
  predictions: r.predictions,
  engineVersion: r.engineVersion,
  createdBy: r.createdBy ? { id: r.createdBy, name: r.creator?.name ?? '' } : null,
  createdAt: r.createdAt.toISOString(),
  sentAt: r.sentAt ? r.sentAt.toISOString() : null,
  sentBy: r.sentBy ? { id: r.sentBy, name: r.sender?.name ?? '' } : null,
})

/** Versions of a case's plan, newest first; `sentOnly` leaves drafts out (scope `sent`). */
export async function listPlanVersions(caseId: string, sentOnly: boolean, t?: Transaction): Promise<PlanVersion[]> {
  const Plan = models().TreatmentPlan
  const rows = await Plan.scope(sentOnly ? ['withPeople', 'sent'] : ['withPeople']).findAll({ where: { caseId }, order: [['version', 'DESC']], transaction: t })
  return rows.map(toVersion)
}

export async function findPlanVersion(caseId: string, version: number, t?: Transaction): Promise<PlanVersion | null> {
  const r = await models().TreatmentPlan.scope('withPeople').findOne({ where: { caseId, version }, transaction: t })
  return r ? toVersion(r) : null
}

/** Stores the next version number of the case's plan; the case row lock keeps two saves from taking the same number. */
export async function insertPlanVersion(
  input: { caseId: string; roomId: string; roomRevision: number; body: PlanBody; predictions: PlanPredictions; engineVersion: string; createdBy: string },
  t: Transaction,
): Promise<number> {
  const { Case, TreatmentPlan } = models()
  await Case.findByPk(input.caseId, { attributes: ['id'], lock: t.LOCK.UPDATE, transaction: t })
  const last = (await TreatmentPlan.findOne({ where: { caseId: input.caseId }, attributes: [[fn('max', col('version')), 'version']], raw: true, transaction: t })) as { version: number | null } | null
  const row = await TreatmentPlan.create({ ...input, version: Number(last?.version ?? 0) + 1 }, { transaction: t })
  return row.version
}

/** Stamps a version as sent; false when it was sent already (someone else got there first). */
export async function markPlanSent(caseId: string, version: number, userId: string, t: Transaction): Promise<boolean> {
  const [n] = await models().TreatmentPlan.update({ sentAt: dbNow(), sentBy: userId }, { where: { caseId, version, sentAt: null }, transaction: t })
  return n === 1
}
