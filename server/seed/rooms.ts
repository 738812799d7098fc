import { roomSchema, type RoomInput } from '../../shared/schemas/room'
import rooms from './data/rooms.json'

export type DemoRoomKey = 'square' | 'longWall' | 'asymmetric' | 'good' | 'attic' | 'smallStudio' | 'sofaLiving' | 'cinema' | 'atticSloped'

/**
 * Invented demo rooms, each showing a different typical problem (and one that is set up well): the table
 * is data/rooms.json. Each room is checked against the room schema when this module loads (a typo in the
 * table fails at once, naming the room); the rooms are kept as written, without the schema's defaults.
 */
export const demoRooms = rooms as unknown as Record<DemoRoomKey, RoomInput>
for (const [key, room] of Object.entries(demoRooms)) {
  const checked = roomSchema.safeParse(room)
  if (!checked.success) throw new Error(`demo room ${key} in server/seed/data/rooms.json: ${checked.error.message}`)
}
