import { roomSchema, type Room } from '../../../shared/schemas/room'
import { planBodySchema, type PlanBody, type PlanBodyInput } from '../../../shared/schemas/plan'

/**
 * An invented room for the plan tests: 6.2 × 4.4 × 2.6 m, hard plaster walls (so reflections are
 * strong), speakers on the short front wall, the seat on the centre line.
 */
export function planRoom(over: Partial<Room> = {}): Room {
  return roomSchema.parse({
    name: 'Plan test room',
    length: 6.2,
    width: 4.4,
    height: 2.6,
    celsius: 20,
    speakers: [
      { label: 'L', x: 0.8, y: 1.2, z: 1.05 },
      { label: 'R', x: 0.8, y: 3.2, z: 1.05 },
    ],
    seats: [{ label: 'Main seat', x: 3.9, y: 2.2, z: 1.1 }],
    openings: [],
    surfaces: {
      front: 'plaster-on-masonry', back: 'plaster-on-masonry', left: 'plaster-on-masonry', right: 'plaster-on-masonry',
      floor: 'wood-floor-on-joists', ceiling: 'plaster-on-masonry',
    },
    furnishings: [{ materialId: 'upholstered-seating-cloth', area: 1.8 }],
    ...over,
  })
}

export const plan = (input: PlanBodyInput = {}): PlanBody => planBodySchema.parse(input)
