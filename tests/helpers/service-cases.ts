import { makeUser } from './api'
import { createRoom } from '../../server/services/rooms'
import { createCase, updateCase } from '../../server/services/cases'
import { demoRooms, type DemoRoomKey } from '../../server/seed/rooms'
import { roomSchema } from '../../shared/schemas/room'

/**
 * Straight through the services (no HTTP, for the browser tests): a new listener, advisor and supervisor
 * under the given names; one of the demo rooms, renamed, for the listener; a case on it, submitted and
 * taken into review by the advisor (and assigned to them when `assign` is set).
 */
export async function caseInReview(opts: {
  names: { listener: string; advisor: string; supervisor: string }
  room: DemoRoomKey
  roomName: string
  title: string
  description: string
  assign?: boolean
}) {
  const listener = await makeUser('listener', opts.names.listener)
  const advisor = await makeUser('advisor', opts.names.advisor)
  const supervisor = await makeUser('supervisor', opts.names.supervisor)
  const room = await createRoom(listener, roomSchema.parse({ ...demoRooms[opts.room], name: opts.roomName }))
  const c = await createCase(listener, { roomId: room.id, title: opts.title, description: opts.description })
  await updateCase(listener, c.id, { status: 'submitted', fromStatus: 'draft' })
  await updateCase(advisor, c.id, { status: 'in_review', fromStatus: 'submitted', ...(opts.assign ? { assigneeId: advisor.id } : {}) })
  return { listener, advisor, supervisor, room, c }
}
