import type { RoomInput } from '../../shared/schemas/room'

/** An invented test room: 5.8 × 4.1 × 2.5 m, speakers along the short front wall, the seat near 38 % from the back. */
export function testRoom(overrides: Partial<RoomInput> = {}): RoomInput {
  return {
    name: 'Study with bay window',
    length: 5.8,
    width: 4.1,
    height: 2.5,
    celsius: 21,
    speakers: [
      { label: 'L', x: 0.9, y: 1.1, z: 1.0, kind: 'ported-rear' },
      { label: 'R', x: 0.9, y: 3.0, z: 1.0, kind: 'ported-rear' },
    ],
    seats: [{ label: 'Main seat', x: 3.6, y: 2.05, z: 1.1 }],
    openings: [{ wall: 'left', kind: 'door', from: 4.6, to: 5.5, bottom: 0, top: 2.0 }],
    surfaces: {
      front: 'gypsum-on-studs',
      back: 'gypsum-on-studs',
      left: 'plaster-on-masonry',
      right: 'plaster-on-masonry',
      floor: 'wood-floor-on-joists',
      ceiling: 'plasterboard-ceiling-on-battens',
    },
    furnishings: [{ materialId: 'upholstered-seating-cloth', area: 1.6 }],
    ...overrides,
  }
}
