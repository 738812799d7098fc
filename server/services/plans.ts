import { findCase } from '../data/cases'
import { insertEvent } from '../data/events'
import { findPlanVersion, insertPlanVersion, listPlanVersions, markPlanSent } from '../data/plans'
import { findRoom } from '../data/rooms'
import { withTransaction } from '../db/transaction'
import { conflict, forbidden, notFound } from '../errors'
import { ENGINE_VERSION } from '../../shared/acoustics'
import { changeIds } from '../../shared/plan'
import type { User } from '../../shared/schemas/auth'
import type { Room } from '../../shared/schemas/room'
import { planBodySchema, type PlanBodyInput, type PlanVersion, type PlanVersionSummary, type SendPlanInput } from '../../shared/schemas/plan'
import { isStaff, readableCase } from './access'
import { moveCase } from './cases'
import { publishCase, publishQueue } from './live'
import { notifyListener } from './notify'
import { planPredictions, planPreview } from './plan-predictions'
import { renderPlanPdf } from './report-pdf'

const summaryOf = (p: PlanVersion, current: boolean): PlanVersionSummary => ({
  version: p.version, status: p.status, roomRevision: p.roomRevision, createdBy: p.createdBy, createdAt: p.createdAt, sentAt: p.sentAt,
  changeCount: changeIds(p.body).length, current,
})

async function caseRoom(roomId: string, revision: number): Promise<Room> {
  const room = await findRoom(roomId, revision)
  if (!room) throw notFound('The room of this case')
  return room.room
}

/** Staff see every version; the listener sees the versions that were sent. */
export async function listPlans(user: User, caseId: string): Promise<PlanVersionSummary[]> {
  await readableCase(user, caseId)
  const versions = await listPlanVersions(caseId, !isStaff(user))
  return versions.map((p, i) => summaryOf(p, i === 0))
}

/** One version with the room revision it was made for; a listener asking for a draft gets 404. */
export async function getPlan(user: User, caseId: string, version: number): Promise<PlanVersion & { room: Room; caseTitle: string }> {
  const c = await readableCase(user, caseId)
  const p = await findPlanVersion(caseId, version)
  if (!p || (!isStaff(user) && p.status !== 'sent')) throw notFound('That plan version')
  return { ...p, room: await caseRoom(p.roomId, p.roomRevision), caseTitle: c.title }
}

/** Saves the plan as the case's next version (a draft), with the engine's predictions stored beside it. */
export async function createPlan(user: User, caseId: string, input: PlanBodyInput): Promise<PlanVersion> {
  if (!isStaff(user)) throw forbidden('Only advisors and supervisors write plans')
  const c = await readableCase(user, caseId)
  if (c.status === 'closed') throw conflict('This case is closed; reopen it before revising the plan', 'closed')
  const body = planBodySchema.parse(input)
  const room = await caseRoom(c.room.id, c.room.revision)
  const predictions = await planPredictions(room, body)
  const version = await withTransaction(async (t, afterCommit) => {
    const v = await insertPlanVersion({ caseId, roomId: c.room.id, roomRevision: c.room.revision, body, predictions, engineVersion: ENGINE_VERSION, createdBy: user.id }, t)
    const seq = await insertEvent({ caseId, actorId: user.id, kind: 'plan-saved', data: { version: v, internal: true } }, t)
    afterCommit(() => publishCase(caseId, { type: 'case.event', caseId, seq, kind: 'plan-saved', internal: true }, { internal: true }))
    return v
  })
  return (await findPlanVersion(caseId, version))!
}

/** The e-mail's summary: the steps in order with their headline figures, then the predicted result. */
export function planEmailSummary(p: PlanVersion, message?: string): string {
  const pr = p.predictions
  const lines: string[] = []
  if (message?.trim()) lines.push(message.trim(), '')
  lines.push('**What to do, in this order**', '')
  pr.order.forEach((id, i) => {
    const c = pr.changes.find((x) => x.id === id)
    if (c) lines.push(`${i + 1}. ${c.title}`)
  })
  lines.push(
    '',
    `**Predicted at your seat:** bass peak-to-dip spread ${pr.before.spreadDb.toFixed(1)} → ${pr.after.spreadDb.toFixed(1)} dB; strong early reflections ${pr.before.firstInWindow} → ${pr.after.firstInWindow}; reverberation time at 500 Hz–1 kHz ${pr.before.rtMidS.toFixed(2)} → ${pr.after.rtMidS.toFixed(2)} s.`,
  )
  return lines.join('\n')
}

/**
 * Sends a version to the listener: the case moves to "plan sent" through the lifecycle (from the
 * status the advisor saw: another one answers 409), the version is stamped sent, and the listener's
 * e-mail is queued in the same transaction. A revision sent while the case is already "plan sent"
 * keeps the status. Only the newest version can be sent.
 */
export async function sendPlan(user: User, caseId: string, version: number, input: SendPlanInput): Promise<PlanVersion> {
  if (!isStaff(user)) throw forbidden('Only advisors and supervisors send plans')
  await readableCase(user, caseId)
  await withTransaction(async (t, afterCommit) => {
    const c = await findCase(caseId, t)
    if (!c) throw notFound('That case')
    if (c.status !== input.fromStatus) throw conflict(`The case is now "${c.status}", not "${input.fromStatus}"; reload to see what changed`, 'stale')
    const p = await findPlanVersion(caseId, version, t)
    if (!p) throw notFound('That plan version')
    if (p.sentAt) throw conflict(`Version ${version} was sent already`, 'already_sent')
    const newest = (await listPlanVersions(caseId, false, t))[0]
    if (newest && newest.version !== version) throw conflict(`Version ${newest.version} is newer; send that one or save a new version`, 'superseded')
    if (c.status !== 'plan_sent') await moveCase(user, caseId, c.status, 'plan_sent', t, afterCommit, { planVersion: version })
    if (!(await markPlanSent(caseId, version, user.id, t))) throw conflict(`Version ${version} was sent already`, 'already_sent')
    const seq = await insertEvent({ caseId, actorId: user.id, kind: 'plan-sent', data: { version } }, t)
    await notifyListener({ caseId, event: 'plan-sent', vars: { advisorName: user.name, summary: planEmailSummary(p, input.message) } }, t)
    afterCommit(() => {
      publishCase(caseId, { type: 'case.event', caseId, seq, kind: 'plan-sent' })
      publishCase(caseId, { type: 'case.updated', caseId })
      publishQueue(caseId)
    })
  })
  return (await findPlanVersion(caseId, version))!
}

/** Predictions, snap targets and setup suggestions for an unsaved plan on the case's current room. */
export async function previewPlan(user: User, caseId: string, input: PlanBodyInput) {
  if (!isStaff(user)) throw forbidden('Only advisors and supervisors preview plans')
  const c = await readableCase(user, caseId)
  const room = await caseRoom(c.room.id, c.room.revision)
  return { roomRevision: c.room.revision, ...(await planPreview(room, planBodySchema.parse(input))) }
}

/** The printable PDF of a version (same access as reading it). */
export async function planReport(user: User, caseId: string, version: number): Promise<{ pdf: Buffer; fileName: string }> {
  const p = await getPlan(user, caseId, version)
  const c = (await findCase(caseId))!
  const pdf = await renderPlanPdf({ plan: p, room: p.room, caseTitle: c.title, listenerName: c.listener.name })
  return { pdf, fileName: `roomwright-plan-v${version}.pdf` }
}
