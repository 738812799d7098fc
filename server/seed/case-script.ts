import type { CreateCaseInput, MessageInput, UpdateCaseInput } from '../../shared/schemas/case'
import { roomSchema } from '../../shared/schemas/room'
import type { User } from '../../shared/schemas/auth'
import { findUserByEmail, toPublicUser } from '../data/users'
import { createRoom } from '../services/rooms'
import { createCase, updateCase } from '../services/cases'
import { postMessage } from '../services/messages'
import { demoRooms, type DemoRoomKey } from './rooms'

/** A demo person by e-mail (seeded by step 0001); a missing one stops the seed. */
export async function demoPerson(email: string): Promise<User> {
  const u = await findUserByEmail(email)
  if (!u) throw new Error(`demo person ${email} is missing`)
  return toPublicUser(u)
}

/** One thing done on a demo case, by the person with the e-mail `by`: a change to the case, or a message. */
export type DemoCaseStep = { by: string; update: UpdateCaseInput } | { by: string; message: MessageInput }

/** A demo case as a script: whose it is, its room (one of the demo rooms), what they wrote, then what happened. */
export interface DemoCaseScript {
  listener: string
  room: DemoRoomKey
  case: Omit<CreateCaseInput, 'roomId'>
  steps: readonly DemoCaseStep[]
}

/**
 * Plays one script through the same services people use: the room, the case, then each step in order.
 * A step's `update.assigneeId` of `"self"` stands for the person doing it (a claim).
 */
export async function playCase(script: DemoCaseScript) {
  const listener = await demoPerson(script.listener)
  const room = await createRoom(listener, roomSchema.parse(demoRooms[script.room]))
  const c = await createCase(listener, { ...script.case, roomId: room.id })
  for (const step of script.steps) {
    const by = step.by === script.listener ? listener : await demoPerson(step.by)
    if ('update' in step) await updateCase(by, c.id, step.update.assigneeId === 'self' ? { ...step.update, assigneeId: by.id } : step.update)
    else await postMessage(by, c.id, step.message)
  }
  return { listener, room, case: c }
}
