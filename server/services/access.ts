import { findCase, roomHasSubmittedCase } from '../data/cases'
import { findRoom } from '../data/rooms'
import { notFound } from '../errors'
import type { User } from '../../shared/schemas/auth'
import type { Transaction } from 'sequelize'

export const isStaff = (u: User) => u.role === 'advisor' || u.role === 'supervisor'

/**
 * A case is readable by its listener, and by advisors and supervisors once it has been submitted.
 * Everyone else gets 404, so nobody learns that a case they may not see exists.
 */
export async function readableCase(user: User, caseId: string, t?: Transaction) {
  if (!/^[0-9a-f-]{36}$/i.test(caseId)) throw notFound('That case')
  const c = await findCase(caseId, t)
  if (!c) throw notFound('That case')
  if (c.listenerId === user.id) return c
  if (isStaff(user) && c.status !== 'draft') return c
  throw notFound('That case')
}

/** Rooms: the owner, or staff when the room belongs to a case they may read. */
export async function readableRoom(user: User, roomId: string, revision?: number) {
  if (!/^[0-9a-f-]{36}$/i.test(roomId)) throw notFound('That room')
  const room = await findRoom(roomId, revision)
  if (!room) throw notFound('That room')
  if (room.ownerId === user.id) return room
  if (isStaff(user) && (await roomHasSubmittedCase(roomId))) return room
  throw notFound('That room')
}
