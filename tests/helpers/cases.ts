import type { Client } from './api'
import { testRoom } from './rooms'
import type { RoomInput } from '../../shared/schemas/room'

/** A listener's room and a case on it; submitted unless told otherwise. */
export async function openCase(listener: Client, opts: { submit?: boolean; title?: string; room?: Partial<RoomInput>; description?: string } = {}) {
  const room = (await listener.post('/api/rooms', testRoom(opts.room)).expect(201)).body
  const created = (
    await listener
      .post('/api/cases', {
        roomId: room.id,
        title: opts.title ?? 'Boomy bass at the sofa',
        description: opts.description ?? 'The bass swells around 45 Hz at my seat and the stereo image leans to the left.',
        answers: { use: 'Jazz and classical, some films', seat: 'The middle of the sofa', bothers: 'Boom on bass notes', budget: '250-1000', constraints: 'Rented flat: nothing glued to the walls' },
      })
      .expect(201)
  ).body
  if (opts.submit !== false) await listener.patch(`/api/cases/${created.id}`, { status: 'submitted', fromStatus: 'draft' }).expect(200)
  return { room, case: created as { id: string; status: string } }
}
