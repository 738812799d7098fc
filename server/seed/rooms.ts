import type { RoomInput } from '../../shared/schemas/room'

/** Invented demo rooms, each showing a different typical problem (and one that is set up well). */
const walls = {
  front: 'gypsum-on-studs', back: 'gypsum-on-studs', left: 'plaster-on-masonry', right: 'plaster-on-masonry',
  floor: 'wood-floor-on-joists', ceiling: 'plasterboard-ceiling-on-battens',
} as const

export type DemoRoomKey = 'square' | 'longWall' | 'asymmetric' | 'good' | 'attic' | 'smallStudio' | 'sofaLiving' | 'cinema' | 'atticSloped'

export const demoRooms: Record<DemoRoomKey, RoomInput> = {
  square: {
    name: 'Living room on Kestrel Lane',
    length: 4.6, width: 4.55, height: 2.5, celsius: 21,
    speakers: [{ label: 'L', x: 0.7, y: 1.2, z: 0.95, kind: 'ported-rear' }, { label: 'R', x: 0.7, y: 3.35, z: 0.95, kind: 'ported-rear' }],
    seats: [{ label: 'Sofa middle', x: 2.3, y: 2.27, z: 1.05 }],
    openings: [{ wall: 'back', kind: 'open-doorway', from: 3.4, to: 4.3, bottom: 0, top: 2.05 }, { wall: 'right', kind: 'window', from: 1.2, to: 3.0, bottom: 0.9, top: 2.2 }],
    surfaces: { ...walls, floor: 'wood-floor-on-joists' },
    furnishings: [{ materialId: 'upholstered-seating-cloth', area: 2.2 }, { materialId: 'curtains-light', area: 3.2 }],
    notes: 'Three-seat sofa against nothing; bookcase on the left wall.',
  },
  longWall: {
    name: 'Narrow study, speakers on the long wall',
    length: 3.1, width: 5.9, height: 2.45, celsius: 20,
    speakers: [{ label: 'L', x: 0.45, y: 1.9, z: 1.1, kind: 'sealed' }, { label: 'R', x: 0.45, y: 4.0, z: 1.1, kind: 'sealed' }],
    seats: [{ label: 'Desk chair', x: 2.55, y: 2.95, z: 1.15 }],
    openings: [{ wall: 'left', kind: 'door', from: 1.8, to: 2.7, bottom: 0, top: 2.0 }],
    surfaces: { ...walls, floor: 'carpet-thin-on-concrete' },
    furnishings: [],
  },
  asymmetric: {
    name: 'Basement cinema',
    length: 6.8, width: 4.2, height: 2.3, celsius: 19,
    speakers: [{ label: 'L', x: 0.6, y: 0.55, z: 1.0, kind: 'ported-front' }, { label: 'R', x: 0.9, y: 2.9, z: 1.0, kind: 'ported-front' }],
    seats: [{ label: 'Recliner', x: 3.4, y: 1.5, z: 1.0 }, { label: 'Second row', x: 5.2, y: 2.1, z: 1.1 }],
    subwoofers: [{ label: 'Sub', x: 0.3, y: 0.3, z: 0.25 }],
    openings: [{ wall: 'right', kind: 'open-doorway', from: 1.2, to: 2.4, bottom: 0, top: 2.0 }],
    surfaces: { ...walls, left: 'concrete-rough', right: 'concrete-rough', floor: 'heavy-carpet-on-concrete' },
    furnishings: [{ materialId: 'upholstered-seating-leather', area: 3 }],
  },
  good: {
    name: 'Garden studio',
    length: 6.1, width: 4.3, height: 2.7, celsius: 20,
    speakers: [{ label: 'L', x: 1.0, y: 1.25, z: 1.2, kind: 'sealed' }, { label: 'R', x: 1.0, y: 3.05, z: 1.2, kind: 'sealed' }],
    seats: [{ label: 'Mix position', x: 2.55, y: 2.15, z: 1.2 }],
    openings: [{ wall: 'back', kind: 'door', from: 0.3, to: 1.2, bottom: 0, top: 2.0 }],
    surfaces: { ...walls, front: 'wood-16mm-on-studs', back: 'wood-16mm-on-studs', left: 'wood-16mm-on-studs', right: 'wood-16mm-on-studs', floor: 'carpet-on-felt-underlay' },
    furnishings: [{ materialId: 'upholstered-seating-cloth', area: 1.0 }],
    treatments: [
      { type: 'panel', surface: 'left', materialId: 'rockwool-50mm-40kg', thickness: 0.05, width: 0.6, height: 1.2, x: 1.8, y: 0, z: 1.2, mounting: 'wall' },
      { type: 'panel', surface: 'right', materialId: 'rockwool-50mm-40kg', thickness: 0.05, width: 0.6, height: 1.2, x: 1.8, y: 4.3, z: 1.2, mounting: 'wall' },
    ],
  },
  attic: {
    name: 'Attic listening room',
    length: 5.2, width: 3.6, height: 2.2, celsius: 23,
    speakers: [{ label: 'L', x: 0.35, y: 0.9, z: 0.9, kind: 'open-baffle' }, { label: 'R', x: 0.35, y: 2.7, z: 0.9, kind: 'open-baffle' }],
    seats: [{ label: 'Armchair', x: 2.6, y: 1.8, z: 1.0 }],
    openings: [{ wall: 'front', kind: 'window', from: 1.3, to: 2.3, bottom: 1.0, top: 1.9 }],
    surfaces: { ...walls, floor: 'wood-floor-on-joists' },
    furnishings: [],
    notes: 'The ceiling slopes down on both long sides; 2.2 m is the height of the flat middle strip.',
  },
  smallStudio: {
    name: 'Box-room studio',
    length: 3.3, width: 2.8, height: 2.4, celsius: 21,
    speakers: [{ label: 'L', x: 0.45, y: 0.85, z: 1.2, kind: 'ported-rear' }, { label: 'R', x: 0.45, y: 1.95, z: 1.2, kind: 'ported-rear' }],
    seats: [{ label: 'Desk chair', x: 1.45, y: 1.4, z: 1.15 }],
    openings: [{ wall: 'back', kind: 'door', from: 1.9, to: 2.7, bottom: 0, top: 2.0 }, { wall: 'left', kind: 'window', from: 1.2, to: 2.3, bottom: 0.95, top: 2.1 }],
    surfaces: { ...walls, left: 'gypsum-on-studs', right: 'gypsum-on-studs', floor: 'carpet-thin-on-concrete' },
    furnishings: [{ materialId: 'upholstered-seating-cloth', area: 0.6 }],
    notes: 'Former spare bedroom; the desk stands against the front wall with the monitors on stands behind it.',
  },
  sofaLiving: {
    name: 'Living room, sofa on the back wall',
    length: 5.8, width: 4.1, height: 2.55, celsius: 21,
    speakers: [{ label: 'L', x: 0.75, y: 0.95, z: 0.95, kind: 'ported-rear' }, { label: 'R', x: 0.75, y: 3.15, z: 0.95, kind: 'ported-rear' }],
    seats: [{ label: 'Sofa, middle', x: 5.4, y: 2.05, z: 1.0 }],
    openings: [{ wall: 'left', kind: 'window', from: 1.5, to: 3.6, bottom: 0.8, top: 2.2 }, { wall: 'right', kind: 'open-doorway', from: 4.5, to: 5.4, bottom: 0, top: 2.05 }],
    surfaces: { ...walls, floor: 'wood-floor-on-joists' },
    furnishings: [{ materialId: 'upholstered-seating-cloth', area: 2.6 }, { materialId: 'curtains-cotton-draped', area: 4 }],
    notes: 'The sofa stands right against the back wall, the backrest touching it. A small rug in front of it.',
  },
  cinema: {
    name: 'Dedicated cinema',
    length: 7.2, width: 4.8, height: 2.6, celsius: 20,
    speakers: [
      { label: 'L', x: 0.55, y: 1.1, z: 1.1, kind: 'sealed' }, { label: 'C', x: 0.5, y: 2.4, z: 0.8, kind: 'sealed' }, { label: 'R', x: 0.55, y: 3.7, z: 1.1, kind: 'sealed' },
    ],
    subwoofers: [{ label: 'Sub', x: 0.35, y: 1.6, z: 0.3, kind: 'sealed' }],
    seats: [{ label: 'Front row, centre', x: 3.6, y: 2.4, z: 1.0 }, { label: 'Back row, centre', x: 5.4, y: 2.4, z: 1.3 }],
    openings: [{ wall: 'back', kind: 'door', from: 3.6, to: 4.5, bottom: 0, top: 2.05 }],
    surfaces: { ...walls, left: 'plasterboard-double-on-frame', right: 'plasterboard-double-on-frame', front: 'plasterboard-double-on-frame', back: 'plasterboard-double-on-frame', floor: 'heavy-carpet-on-concrete' },
    furnishings: [{ materialId: 'upholstered-seating-cloth', area: 5 }, { materialId: 'curtains-heavy-folded', area: 9 }],
    notes: 'Built as a cinema: one 12-inch sealed subwoofer beside the screen, a riser for the back row, curtains in front of the screen wall.',
  },
  atticSloped: {
    name: 'Attic under a sloped roof',
    length: 5.6, width: 4.0, height: 2.35, celsius: 22,
    speakers: [{ label: 'L', x: 0.6, y: 1.05, z: 0.95, kind: 'sealed' }, { label: 'R', x: 0.6, y: 2.95, z: 0.95, kind: 'sealed' }],
    seats: [{ label: 'Reading chair', x: 3.1, y: 2.0, z: 1.0 }],
    openings: [{ wall: 'back', kind: 'door', from: 0.4, to: 1.2, bottom: 0, top: 1.95 }, { wall: 'right', kind: 'window', from: 2.2, to: 3.1, bottom: 1.0, top: 1.9 }],
    surfaces: { ...walls, left: 'gypsum-on-studs', right: 'gypsum-on-studs', floor: 'wood-floor-on-joists' },
    furnishings: [{ materialId: 'upholstered-seating-cloth', area: 0.9 }],
    notes: 'Sloped ceiling: the roof comes down to 1.1 m along both side walls; 2.35 m is the height under the ridge, along the centre line.',
  },
}
