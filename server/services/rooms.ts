import { addRoomRevision, findRoom, insertRoom, listRooms } from '../data/rooms'
import { openCasesForRoom, updateCaseFields } from '../data/cases'
import { insertEvent } from '../data/events'
import { withTransaction } from '../db/transaction'
import { badRequest, notFound } from '../errors'
import { materialIds } from '../../shared/acoustics'
import type { Room, RoomRecord } from '../../shared/schemas/room'
import type { User } from '../../shared/schemas/auth'
import { readableRoom } from './access'
import { analyseRoomOffThread, analyseRoomOffThreadJson, assertWithinEngineLimits, storeTriage } from './triage'
import { findUserById } from '../data/users'
import { publishCase, publishQueue } from './live'

/** Material ids must come from the engine's materials table (field paths in the 400). */
export function checkMaterials(room: Room) {
  const known = new Set(materialIds())
  const fields: { path: string; message: string }[] = []
  for (const [surface, id] of Object.entries(room.surfaces)) if (!known.has(id)) fields.push({ path: `surfaces.${surface}`, message: `unknown material "${id}"` })
  room.furnishings.forEach((f, i) => { if (!known.has(f.materialId)) fields.push({ path: `furnishings.${i}.materialId`, message: `unknown material "${f.materialId}"` }) })
  room.treatments.forEach((tr, i) => { if (tr.materialId && !known.has(tr.materialId)) fields.push({ path: `treatments.${i}.materialId`, message: `unknown material "${tr.materialId}"` }) })
  if (fields.length) throw badRequest('Some fields need another look', fields)
}

export async function createRoom(user: User, room: Room): Promise<RoomRecord> {
  checkMaterials(room)
  assertWithinEngineLimits(room)
  return insertRoom(user.id, room)
}

export const listMyRooms = (user: User) => listRooms(user.id)

export async function getRoom(user: User, id: string, revision?: number): Promise<RoomRecord> {
  return readableRoom(user, id, revision)
}

/**
 * Saving a room makes a new revision (old ones stay readable). Every open, submitted case on the room
 * moves to the new revision and gets a fresh triage; a draft just follows the room. The engine runs
 * first, in the worker pool; the transaction only writes.
 */
export async function saveRoomRevision(user: User, id: string, room: Room): Promise<RoomRecord> {
  checkMaterials(room)
  const existing = await findRoom(id)
  if (!existing || existing.ownerId !== user.id) throw notFound('That room')
  const prepared = { roomId: id, revision: null, analysis: await analyseRoomOffThread(room) }
  const touched: string[] = []
  const saved = await withTransaction(async (t, afterCommit) => {
    const saved = await addRoomRevision(id, room, user.id, t)
    for (const c of await openCasesForRoom(id, t)) {
      await updateCaseFields(c.id, { roomRevision: saved.revision }, t)
      if (c.status !== 'draft') {
        await insertEvent({ caseId: c.id, actorId: user.id, kind: 'room-revised', data: { revision: saved.revision } }, t)
        await storeTriage(c.id, prepared, t)
        touched.push(c.id)
      }
    }
    afterCommit(() => touched.forEach((cid) => { publishCase(cid, { type: 'case.updated', caseId: cid }); publishQueue(cid) }))
    return saved
  })
  return saved
}

/** The engine's analysis of an unsaved room as JSON text, computed and serialised in the worker pool; setup-flag messages in the signed-in person's units. */
export async function previewRoom(room: Room, userId?: string): Promise<string> {
  checkMaterials(room)
  const units = userId ? (await findUserById(userId))?.units ?? 'metric' : 'metric'
  return analyseRoomOffThreadJson(room, units)
}
