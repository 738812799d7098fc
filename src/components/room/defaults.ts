import type { Room } from '../../../shared/schemas/room'

/**
 * An invented, typical living room for a new description, so the plan and the preview show something
 * at once: 5.6 × 3.9 × 2.5 m, speakers on the short wall, a sofa two thirds of the way back,
 * a rug, curtains at the window.
 */
export function newRoomDraft(): Room {
  return {
    name: 'Living room',
    length: 5.6,
    width: 3.9,
    height: 2.5,
    celsius: 20,
    speakers: [
      { label: 'L', x: 0.8, y: 1.0, z: 0.95, kind: 'ported-rear' },
      { label: 'R', x: 0.8, y: 2.9, z: 0.95, kind: 'ported-rear' },
    ],
    subwoofers: [],
    seats: [{ label: 'Main seat', x: 3.35, y: 1.95, z: 1.05 }],
    openings: [
      { wall: 'back', kind: 'door', from: 2.9, to: 3.7, bottom: 0, top: 2.05 },
      { wall: 'right', kind: 'window', from: 2.2, to: 3.6, bottom: 0.85, top: 2.2 },
    ],
    surfaces: {
      front: 'plaster-on-masonry',
      back: 'gypsum-on-studs',
      left: 'plaster-on-masonry',
      right: 'plaster-on-masonry',
      floor: 'wood-floor-on-joists',
      ceiling: 'plasterboard-ceiling-on-battens',
    },
    furnishings: [
      { materialId: 'upholstered-seating-cloth', area: 1.8 },
      { materialId: 'upholstered-seating-cloth', area: 0.7 },
      { materialId: 'curtains-cotton-draped', area: 3.2 },
    ],
    treatments: [
      { type: 'rug', surface: 'floor', materialId: 'heavy-carpet-on-concrete', thickness: 0.01, width: 2.0, height: 1.6, x: 2.4, y: 1.95, z: 0 },
    ],
    notes: '',
  }
}

/** A deep copy that shares nothing with the original (drafts are edited in place). */
export function cloneRoom(room: Room): Room {
  return JSON.parse(JSON.stringify(room)) as Room
}

/** The next free label in a list, e.g. 'Seat 2', 'Sub 1'. */
export function nextLabel(prefix: string, used: readonly { label: string }[]): string {
  const taken = new Set(used.map((item) => item.label))
  for (let n = used.length + 1; ; n++) if (!taken.has(`${prefix} ${n}`)) return `${prefix} ${n}`
}
