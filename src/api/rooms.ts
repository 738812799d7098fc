import { z } from 'zod'
import { roomSchema, roomSummarySchema, type Room, type RoomInput, type RoomRecord, type RoomSummary } from '../../shared/schemas/room'
import { api } from './client'
import { subwooferAdviceSchema, type SubwooferAdviceShape } from '../../shared/schemas/subwoofers'

const roomRecordSchema: z.ZodType<RoomRecord> = z.object({
  id: z.string(),
  ownerId: z.string(),
  revision: z.number().int(),
  revisions: z.array(z.number().int()),
  room: roomSchema,
  createdAt: z.string(),
  updatedAt: z.string(),
}) as unknown as z.ZodType<RoomRecord>

const roomListSchema = z.object({ rooms: z.array(roomSummarySchema) })

/** The signed-in listener's rooms, latest revision of each. */
export async function listRooms(): Promise<RoomSummary[]> {
  return (await api.get('/api/rooms', { schema: roomListSchema })).rooms
}

/** One room at its latest revision, or at `revision` when given (older revisions stay readable). */
export function getRoom(id: string, revision?: number): Promise<RoomRecord> {
  return api.get(`/api/rooms/${encodeURIComponent(id)}`, { schema: roomRecordSchema, query: { revision } })
}

/** Creates a room (revision 1); 400 with field paths such as `seats.0.x`. */
export function createRoom(room: Room | RoomInput): Promise<RoomRecord> {
  return api.post('/api/rooms', room, { schema: roomRecordSchema })
}

/** Saves a new revision of a room; older revisions stay readable. */
export function saveRoom(id: string, room: Room | RoomInput): Promise<RoomRecord> {
  return api.put(`/api/rooms/${encodeURIComponent(id)}`, room, { schema: roomRecordSchema })
}

/** Where 1, 2 and 4 subwoofers should stand for every seat of the room as described (searched on the server's worker pool). */
export function searchSubwoofers(room: Room | RoomInput, counts?: number[]): Promise<SubwooferAdviceShape> {
  return api.post('/api/rooms/subwoofers', { room, counts }, { schema: subwooferAdviceSchema })
}
