import { Op, col, fn, type Transaction } from 'sequelize'
import { randomBytes } from 'node:crypto'
import { models, type CaseModel } from '../db/models'
import { dbNow } from '../db/models/now'
import type { CaseDetail, CaseStatus, CaseSummary } from '../../shared/schemas/case'

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null)

/** A case loaded with the `withRoom` scope, as the API lists it. */
export const caseToSummary = (c: CaseModel): CaseSummary => {
  const body = c.revision?.body
  return {
    id: c.id,
    title: c.title,
    status: c.status,
    score: c.score,
    listener: { id: c.listenerId, name: c.listener?.name ?? '' },
    assignee: c.assigneeId ? { id: c.assigneeId, name: c.assignee?.name ?? '' } : null,
    room: { id: c.roomId, name: c.room?.name ?? '', revision: c.roomRevision, length: Number(body?.length), width: Number(body?.width), height: Number(body?.height) },
    flags: c.flags ?? [],
    createdAt: iso(c.createdAt)!,
    submittedAt: iso(c.submittedAt),
    waitingSince: iso(c.waitingSince),
    lastActivityAt: iso(c.lastActivityAt)!,
  }
}
const caseToDetail = (c: CaseModel): CaseDetail => ({ ...caseToSummary(c), description: c.description, answers: c.answers, listenerId: c.listenerId })

export async function insertCase(input: { listenerId: string; roomId: string; roomRevision: number; title: string; description: string; answers: object }, t?: Transaction): Promise<string> {
  const c = await models().Case.create(
    { ...input, answers: input.answers as CaseDetail['answers'], replyToken: randomBytes(24).toString('hex') },
    { transaction: t },
  )
  return c.id
}

/** The case as the API shows it; the reply-by-e-mail token is a secret of the mail path (server/mail/outbox.ts) and never part of it. */
export async function findCase(id: string, t?: Transaction): Promise<CaseDetail | null> {
  const c = await models().Case.scope('withRoom').findByPk(id, { transaction: t })
  return c ? caseToDetail(c) : null
}

export async function findCaseIdByReplyToken(token: string): Promise<{ id: string; listenerId: string } | null> {
  const c = await models().Case.findOne({ where: { replyToken: token }, attributes: ['id', 'listenerId'] })
  return c ? { id: c.id, listenerId: c.listenerId } : null
}

export async function listCasesOfListener(listenerId: string): Promise<CaseSummary[]> {
  const rows = await models().Case.scope('withRoom').findAll({ where: { listenerId }, order: [['lastActivityAt', 'DESC']] })
  return rows.map(caseToSummary)
}

/** The column's time when it has one, else the database clock (`COALESCE(column, now())`). */
const keep = (column: string) => fn('COALESCE', col(column), dbNow())

/** Moves a case from exactly `from` to `to`; false when someone else moved it first (a stale transition). */
export async function updateStatus(id: string, from: CaseStatus, to: CaseStatus, t: Transaction): Promise<boolean> {
  const [n] = await models().Case.update(
    {
      status: to,
      updatedAt: dbNow(),
      lastActivityAt: dbNow(),
      ...(to === 'submitted' ? { submittedAt: keep('submitted_at') } : {}),
      closedAt: to === 'closed' ? dbNow() : null,
      waitingSince: to === 'submitted' || to === 'in_review' ? keep('waiting_since') : null,
    },
    { where: { id, status: from }, transaction: t },
  )
  return n === 1
}

export async function updateCaseFields(id: string, patch: { title?: string; description?: string; answers?: object; roomId?: string; roomRevision?: number }, t?: Transaction) {
  const defined = Object.fromEntries(Object.entries(patch).filter(([, v]) => v !== undefined && v !== null))
  await models().Case.update({ ...defined, updatedAt: dbNow(), lastActivityAt: dbNow() }, { where: { id }, transaction: t })
}

/** Sets the assignee; with `expectedAssignee` only when the case still has that one (someone else may have claimed it). */
export async function setAssignee(id: string, assigneeId: string | null, expectedAssignee: string | null | undefined, t: Transaction): Promise<boolean> {
  const [n] = await models().Case.update(
    { assigneeId, updatedAt: dbNow(), lastActivityAt: dbNow() },
    { where: { id, ...(expectedAssignee !== undefined ? { assigneeId: expectedAssignee } : {}) }, transaction: t },
  )
  return n === 1
}

/** After a message: the team's reply stops the "waiting for us" clock and counts as a first response; a listener's starts it. */
export async function touchAfterMessage(id: string, by: 'team' | 'listener', t: Transaction) {
  const Case = models().Case
  if (by === 'team') {
    await Case.update({ lastActivityAt: dbNow(), waitingSince: null, firstResponseAt: keep('first_response_at') }, { where: { id }, transaction: t })
  } else {
    await Case.update({ lastActivityAt: dbNow() }, { where: { id }, transaction: t })
    // the wait for the team starts with the listener's message only while the case is the team's to answer
    await Case.update({ waitingSince: dbNow() }, { where: { id, status: ['submitted', 'in_review'], waitingSince: null }, transaction: t })
  }
}

export async function touchActivity(id: string, t?: Transaction) {
  await models().Case.update({ lastActivityAt: dbNow() }, { where: { id }, transaction: t })
}

export async function setScore(id: string, score: number, flags?: { id: string; severity: string }[], t?: Transaction) {
  await models().Case.update({ score, ...(flags ? { flagIds: flags.map((f) => f.id), flags } : {}) }, { where: { id }, transaction: t })
}

export async function openCasesForRoom(roomId: string, t?: Transaction): Promise<{ id: string; status: CaseStatus }[]> {
  const rows = await models().Case.findAll({ where: { roomId, status: { [Op.ne]: 'closed' } }, attributes: ['id', 'status'], transaction: t })
  return rows.map((r) => ({ id: r.id, status: r.status }))
}

/** Whether any non-draft case is about the room (the team may then read the room). */
export async function roomHasSubmittedCase(roomId: string): Promise<boolean> {
  return (await models().Case.findOne({ where: { roomId, status: { [Op.ne]: 'draft' } }, attributes: ['id'] })) !== null
}
