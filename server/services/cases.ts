import type { Transaction } from 'sequelize'
import { findCase, insertCase, listCasesOfListener, setAssignee, updateCaseFields, updateStatus } from '../data/cases'
import { findRoom } from '../data/rooms'
import { insertEvent } from '../data/events'
import { findUserById } from '../data/users'
import { withTransaction } from '../db/transaction'
import { AppError, badRequest, conflict, forbidden, notFound } from '../errors'
import { findTransition } from '../../shared/case-workflow'
import type { CaseDetail, CaseStatus, CreateCaseInput, UpdateCaseInput } from '../../shared/schemas/case'
import { createCaseSchema } from '../../shared/schemas/case'
import type { User } from '../../shared/schemas/auth'
import { isStaff, readableCase } from './access'
import { prepareTriage, storeTriage, type PreparedAnalysis } from './triage'
import { publishCase, publishQueue } from './live'
import { notifyListener } from './notify'

export async function createCase(user: User, input: CreateCaseInput): Promise<CaseDetail> {
  const body = createCaseSchema.parse(input)
  const room = await findRoom(body.roomId)
  if (!room || room.ownerId !== user.id) throw badRequest('Choose one of your own rooms', [{ path: 'roomId', message: 'not one of your rooms' }])
  const id = await withTransaction(async (t) => {
    const id = await insertCase({ listenerId: user.id, roomId: room.id, roomRevision: room.revision, title: body.title, description: body.description, answers: body.answers }, t)
    await insertEvent({ caseId: id, actorId: user.id, kind: 'created', toStatus: 'draft' }, t)
    return id
  })
  return (await findCase(id))!
}

export const listMyCases = (user: User) => listCasesOfListener(user.id)

/** One PATCH: field edits (listener, draft only), a status move and/or an assignment, in one transaction. */
export async function updateCase(user: User, caseId: string, patch: UpdateCaseInput): Promise<CaseDetail> {
  const current = await readableCase(user, caseId)
  const edits = patch.title !== undefined || patch.description !== undefined || patch.answers !== undefined || patch.roomId !== undefined
  if (edits) {
    if (current.listenerId !== user.id) throw forbidden('Only the listener edits their case')
    if (current.status !== 'draft') throw conflict('A submitted case can no longer be edited; add a message instead', 'not_draft')
  }
  if (patch.fromStatus && patch.fromStatus !== current.status) {
    throw conflict(`The case is now "${current.status}", not "${patch.fromStatus}"; reload to see what changed`, 'stale')
  }
  if (patch.assigneeId !== undefined && !isStaff(user)) throw forbidden('Only advisors and supervisors assign cases')

  // A submission's triage is computed here, in the worker pool, before the transaction opens.
  let prepared: PreparedAnalysis | undefined
  if (patch.status === 'submitted' && current.status === 'draft') {
    if (patch.roomId) {
      const room = await findRoom(patch.roomId)
      if (!room || room.ownerId !== user.id) throw badRequest('Choose one of your own rooms', [{ path: 'roomId', message: 'not one of your rooms' }])
      prepared = await prepareTriage(room.id)
    } else {
      prepared = await prepareTriage(current.room.id, current.room.revision)
    }
  }

  await withTransaction(async (t, afterCommit) => {
    if (edits) {
      let roomRevision: number | undefined
      if (patch.roomId) {
        const room = await findRoom(patch.roomId, undefined, t)
        if (!room || room.ownerId !== user.id) throw badRequest('Choose one of your own rooms', [{ path: 'roomId', message: 'not one of your rooms' }])
        roomRevision = room.revision
      }
      await updateCaseFields(caseId, { title: patch.title, description: patch.description, answers: patch.answers ? { ...current.answers, ...patch.answers } : undefined, roomId: patch.roomId, roomRevision }, t)
    }
    if (patch.assigneeId !== undefined) await assign(user, current, patch.assigneeId, patch.handoffNote, t)
    if (patch.status && patch.status !== current.status) {
      await moveCase(user, caseId, current.status, patch.status, t, afterCommit, {}, prepared)
    } else if (patch.status && patch.fromStatus === undefined && patch.status === current.status && !edits && patch.assigneeId === undefined) {
      throw conflict(`The case is already "${current.status}"`, 'stale')
    }
    afterCommit(() => {
      publishCase(caseId, { type: 'case.updated', caseId })
      publishQueue(caseId)
    })
  })
  return (await findCase(caseId))!
}

/**
 * A status move checked against the lifecycle; a move from a state the case has already left answers 409.
 * A submission stores the triage `prepared` before the transaction (no engine work in a transaction).
 */
export async function moveCase(user: User, caseId: string, from: CaseStatus, to: CaseStatus, t: Transaction, afterCommit: (cb: () => void) => void, data: object = {}, prepared?: PreparedAnalysis) {
  const c = await findCase(caseId, t)
  if (!c) throw notFound('That case')
  if (user.role === 'listener' && c.listenerId !== user.id) throw notFound('That case')
  if (!findTransition(from, to, user.role)) {
    throw new AppError(`A case cannot go from "${from}" to "${to}" (as ${user.role})`, { status: 409, code: 'bad_transition' })
  }
  if (!(await updateStatus(caseId, from, to, t))) throw conflict('Someone else changed this case first; reload to see what changed', 'stale')
  const seq = await insertEvent({ caseId, actorId: user.id, kind: from === 'closed' ? 'reopened' : 'status', fromStatus: from, toStatus: to, data }, t)
  if (to === 'submitted' && from === 'draft') {
    if (!prepared) throw new Error('a submission needs its triage prepared (prepareTriage) before the transaction')
    await storeTriage(caseId, prepared, t)
  }
  if (isStaff(user) && from === 'submitted' && to === 'in_review' && !c.assignee) {
    await setAssignee(caseId, user.id, undefined, t)
    await insertEvent({ caseId, actorId: user.id, kind: 'assigned', data: { assigneeId: user.id, assigneeName: user.name } }, t)
  }
  const kind = to === 'submitted' && from === 'draft' ? 'received' : to === 'closed' ? 'closed' : from === 'closed' ? 'reopened' : null
  if (kind) await notifyListener({ caseId, event: 'status-changed', vars: { change: kind } }, t)
  afterCommit(() => publishCase(caseId, { type: 'case.event', caseId, seq, kind: 'status' }))
}

async function assign(user: User, current: CaseDetail, assigneeId: string | null, note: string | undefined, t: Transaction) {
  if (assigneeId) {
    const target = await findUserById(assigneeId)
    if (!target || !target.active || (target.role !== 'advisor' && target.role !== 'supervisor')) {
      throw badRequest('Hand cases only to active advisors or supervisors', [{ path: 'assigneeId', message: 'not an active team member' }])
    }
    // An advisor may claim an unassigned case or hand on their own; supervisors reassign anything.
    if (user.role === 'advisor' && current.assignee && current.assignee.id !== user.id) {
      throw conflict(`${current.assignee.name} already has this case; ask them or a supervisor to hand it over`, 'assigned_elsewhere')
    }
    if (!(await setAssignee(current.id, assigneeId, current.assignee?.id ?? null, t))) throw conflict('Someone else changed the assignment first; reload', 'stale')
    await insertEvent({
      caseId: current.id, actorId: user.id, kind: assigneeId === user.id && !current.assignee ? 'claimed' : 'assigned',
      data: { assigneeId, assigneeName: target.name, fromAssigneeId: current.assignee?.id ?? null, note: note ?? null, internal: !!note },
    }, t)
  } else {
    if (user.role === 'advisor' && current.assignee && current.assignee.id !== user.id) throw forbidden('Only a supervisor may take a case away from another advisor')
    await setAssignee(current.id, null, current.assignee?.id ?? null, t)
    await insertEvent({ caseId: current.id, actorId: user.id, kind: 'unassigned', data: { fromAssigneeId: current.assignee?.id ?? null } }, t)
  }
}
