import type { RoomInput } from '../../shared/schemas/room'
import room from '../fixtures/test-room.json'

/** An invented test room (tests/fixtures/test-room.json): 5.8 × 4.1 × 2.5 m, speakers along the short front wall, the seat near 38 % from the back. */
export function testRoom(overrides: Partial<RoomInput> = {}): RoomInput {
  return { ...structuredClone(room as unknown as RoomInput), ...overrides }
}
