import { findCase } from '../data/cases'
import { findRoom } from '../data/rooms'
import { notFound } from '../errors'
import type { User } from '../../shared/schemas/auth'
import { Op, type Transaction } from 'sequelize'
import { models } from '../db/models'
import type { Audience } from '../data/visibility'

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i

export const isStaff = (u: User) => u.role === 'advisor' || u.role === 'supervisor'
/** Whose view of a readable case `u` gets: the team's (everything) or the listener's (what is shared; server/data/visibility.ts). */
export const audienceOf = (u: User): Audience => (isStaff(u) ? 'team' : 'listener')

/**
 * A case is readable by its listener, and by advisors and supervisors once it has been submitted.
 * Everyone else gets 404, so nobody learns that a case they may not see exists.
 */
export async function readableCase(user: User, caseId: string, t?: Transaction) {
  if (!UUID.test(caseId)) throw notFound('That case')
  const c = await findCase(caseId, t)
  if (!c) throw notFound('That case')
  if (c.listenerId === user.id) return c
  if (isStaff(user) && c.status !== 'draft') return c
  throw notFound('That case')
}

/**
 * Rooms: the owner reads every revision. The team reads only the revisions the listener sent: one a
 * submitted (non-draft) case is on, or was on when it was triaged (each triage snapshot names its
 * revision; a case is triaged on submission and on every revision saved while it is open). A revision
 * the listener saved but never sent answers 404, like a room nobody sent.
 */
export async function readableRoom(user: User, roomId: string, revision?: number) {
  if (!UUID.test(roomId)) throw notFound('That room')
  const room = await findRoom(roomId, revision)
  if (!room) throw notFound('That room')
  if (room.ownerId === user.id) return room
  if (isStaff(user)) {
    const cases = await models().Case.findAll({
      attributes: ['id', 'roomRevision'], where: { roomId, status: { [Op.ne]: 'draft' } },
      include: [{ association: 'triages', attributes: ['id', 'roomRevision'], required: false }],
    })
    const sent = [...new Set(cases.flatMap((c) => [c.roomRevision, ...(c.triages ?? []).map((s) => s.roomRevision)]))].sort((a, b) => a - b)
    // the list of revisions shows the team only the sent ones too
    if (sent.includes(room.revision)) return { ...room, revisions: sent }
  }
  throw notFound('That room')
}
