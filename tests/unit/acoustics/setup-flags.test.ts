import { describe, expect, it } from 'vitest'
import type { SetupFlag, SetupFlagInput } from '../../../shared/acoustics'
import { SETUP_FLAG_IDS, lengthsInUnits, setupFlags } from '../../../shared/acoustics'
import { deepFreeze } from './helpers'

// A well set-up room (our own invented example): 5.9 × 4.3 × 2.55 m, speakers symmetric, seat on the
// centre line near 38 % from the back wall, no openings, no treatments listed.
const good: SetupFlagInput = {
  room: { length: 5.9, width: 4.3, height: 2.55 },
  speakers: [{ x: 1.1, y: 1.0, z: 1.05 }, { x: 1.1, y: 3.3, z: 1.05 }],
  seats: [{ x: 3.55, y: 2.15, z: 1.05 }],
}
const ids = (f: SetupFlag[]) => f.map((x) => x.id)
const withSeat = (seat: { x: number; y: number; z: number }): SetupFlagInput => ({ ...good, seats: [seat] })

describe('setupFlags', () => {
  it('raises none of the six contract flags for a well set-up room', () => {
    const f = ids(setupFlags(good))
    for (const id of ['facing-long-wall', 'speakers-asymmetric', 'seat-off-centreline', 'seat-at-room-centre', 'near-square-plan', 'opening-in-reflection-zone']) expect(f).not.toContain(id)
  })
  it('facing-long-wall: speakers on a long wall (width > length)', () => {
    const f = setupFlags({ room: { length: 4.0, width: 6.0, height: 2.5 }, speakers: [{ x: 0.8, y: 1.8, z: 1 }, { x: 0.8, y: 4.2, z: 1 }], seats: [{ x: 2.9, y: 3.0, z: 1.1 }] })
    expect(ids(f)).toContain('facing-long-wall')
  })
  it('speakers-asymmetric: one speaker much closer to its side wall', () => {
    const f = setupFlags({ ...good, speakers: [{ x: 1.1, y: 0.5, z: 1.05 }, { x: 1.1, y: 3.3, z: 1.05 }] })
    const flag = f.find((x) => x.id === 'speakers-asymmetric')!
    expect(flag.severity).toBe('problem')
    expect(flag.message).toMatch(/0\.50 m from its side wall/)
  })
  it('speaks the listener\'s units: with units "imperial" the same flags say feet and inches (1 ft = 0.3048 m, exact by definition), never metres', () => {
    const asym = { ...good, speakers: [{ x: 1.1, y: 0.5, z: 1.05 }, { x: 1.1, y: 3.3, z: 1.05 }] }
    const metric = setupFlags(asym)
    const imperial = setupFlags({ ...asym, units: 'imperial' })
    expect(ids(imperial)).toEqual(ids(metric))
    // 0.50 m = 19.685 in → 1 ft 7.5 in to the nearest half inch
    expect(imperial.find((x) => x.id === 'speakers-asymmetric')!.message).toMatch(/1 ft 7\.5 in from its side wall/)
    for (const f of imperial) expect(f.message).not.toMatch(/\d m(?![²³a-zA-Z])/)
    expect(lengthsInUnits('0.25 m right, 12 ms later, 3.5 m² of panel', 'imperial')).toBe('10 in right, 12 ms later, 3.5 m² of panel')
    expect(lengthsInUnits('2.00 m', 'imperial')).toBe('6 ft 6.5 in')
    expect(() => setupFlags({ ...good, units: 'cubits' as 'metric' })).toThrow(RangeError)
  })
  it('seat-off-centreline: the main seat 0.25 m off the centre line', () => {
    const f = setupFlags(withSeat({ x: 3.55, y: 2.4, z: 1.05 }))
    expect(f.find((x) => x.id === 'seat-off-centreline')!.message).toMatch(/0\.25 m right of the room's centre line/)
  })
  it('seat-at-room-centre: the seat halfway between front and back wall', () => {
    expect(ids(setupFlags(withSeat({ x: 2.95, y: 2.15, z: 1.05 })))).toContain('seat-at-room-centre')
  })
  it('near-square-plan: a 4.6 × 4.4 m plan', () => {
    const f = setupFlags({ ...good, room: { length: 4.6, width: 4.4, height: 2.5 }, speakers: [{ x: 0.9, y: 1.0, z: 1 }, { x: 0.9, y: 3.4, z: 1 }], seats: [{ x: 2.9, y: 2.2, z: 1.05 }] })
    expect(ids(f)).toContain('near-square-plan')
  })
  it('opening-in-reflection-zone: a window where the left side-wall reflection lands', () => {
    // left speaker (1.1, 1.0) to seat (3.55, 2.15): the left-wall mirror point is at x = 1.1 + 2.45·1.0/3.15 ≈ 1.88 m
    const f = setupFlags({ ...good, openings: [{ wall: 'left', kind: 'window', from: 1.4, to: 2.4, bottom: 0.8, top: 2.0 }] })
    expect(ids(f)).toContain('opening-in-reflection-zone')
    expect(ids(f)).toContain('opening-asymmetry')
    const away = setupFlags({ ...good, openings: [{ wall: 'left', kind: 'window', from: 4.6, to: 5.6, bottom: 0.8, top: 2.0 }] })
    expect(ids(away)).not.toContain('opening-in-reflection-zone')
  })
  it('opening-in-reflection-zone names each opening once, with the speakers whose reflection it takes', () => {
    // the right speaker (1.1, 3.3) reflects off the left wall at x = 1.1 + 2.45·3.3/5.45 ≈ 2.58 m: one window from 1.4 to 3.0 m takes both
    const both = setupFlags({ ...good, openings: [{ wall: 'left', kind: 'window', from: 1.4, to: 3.0, bottom: 0.8, top: 2.0 }] }).find((x) => x.id === 'opening-in-reflection-zone')!
    expect(both.message.match(/the window on the left wall/g)).toHaveLength(1)
    expect(both.message).toMatch(/from the window on the left wall \(both speakers\)\./)
    // a window catching only the left speaker's reflection, and a door on the right wall catching both
    const two = setupFlags({ ...good, openings: [
      { wall: 'left', kind: 'window', from: 1.4, to: 2.2, bottom: 0.8, top: 2.0 },
      { wall: 'right', kind: 'door', from: 1.4, to: 3.0, bottom: 0, top: 2.0 },
    ] }).find((x) => x.id === 'opening-in-reflection-zone')!
    expect(two.message).toMatch(/from the window on the left wall \(the left speaker\), the door on the right wall \(both speakers\)\./)
  })
  it('coincident-low-modes and dimension-multiples: a 6 × 3 × 3 m room', () => {
    const f = setupFlags({ room: { length: 6, width: 3, height: 3 }, speakers: [{ x: 0.8, y: 0.8, z: 1 }, { x: 0.8, y: 2.2, z: 1 }], seats: [{ x: 3.7, y: 1.5, z: 1.1 }] })
    expect(ids(f)).toContain('coincident-low-modes')
    expect(ids(f)).toContain('dimension-multiples')
  })
  it('seat-near-wall: 0.25 m from the back wall is a problem', () => {
    const f = setupFlags(withSeat({ x: 5.65, y: 2.15, z: 1.05 })).find((x) => x.id === 'seat-near-wall')!
    expect(f.severity).toBe('problem')
  })
  it('speaker-spacing-vs-listening-distance: speakers 1.2 m apart seen from 4 m away', () => {
    const f = setupFlags({ ...good, speakers: [{ x: 0.8, y: 1.55, z: 1 }, { x: 0.8, y: 2.75, z: 1 }], seats: [{ x: 4.8, y: 2.15, z: 1.05 }] })
    expect(f.find((x) => x.id === 'speaker-spacing-vs-listening-distance')!.message).toMatch(/span 17°/)
  })
  it('speaker-too-close-to-boundary: equal distance to front and side wall stacks the notches (warning)', () => {
    const f = setupFlags({ ...good, speakers: [{ x: 0.7, y: 0.7, z: 1.6 }, { x: 0.7, y: 3.6, z: 1.6 }] })
    expect(f.find((x) => x.id === 'speaker-too-close-to-boundary')!.severity).toBe('warning')
  })
  it('one-sided-corner-treatment: a bass trap in the front-left corner only', () => {
    const trap = { type: 'bass-trap', surface: 'front' as const, x: 0, y: 0.2, z: 1.2, width: 0.5, height: 2 }
    expect(ids(setupFlags({ ...good, treatments: [trap] }))).toContain('one-sided-corner-treatment')
    expect(ids(setupFlags({ ...good, treatments: [trap, { ...trap, y: 4.1 }] }))).not.toContain('one-sided-corner-treatment')
  })
  it('untreated-first-reflections only when treatments are listed, and a panel on each spot clears it', () => {
    expect(ids(setupFlags(good))).not.toContain('untreated-first-reflections')
    const bare = setupFlags({ ...good, treatments: [] })
    expect(ids(bare)).toContain('untreated-first-reflections')
    const panels = [1.5, 2.4].flatMap((x) => [
      { type: 'panel', surface: 'left' as const, x, y: 0, z: 1.05, width: 1.0, height: 1.0, thickness: 0.05 },
      { type: 'panel', surface: 'right' as const, x, y: 4.3, z: 1.05, width: 1.0, height: 1.0, thickness: 0.05 },
    ])
    expect(ids(setupFlags({ ...good, treatments: panels }))).not.toContain('untreated-first-reflections')
  })
  it('every flag has a known id, a severity and a complete message; problems come first', () => {
    const bad: SetupFlagInput = {
      room: { length: 4.6, width: 4.5, height: 2.3 },
      speakers: [{ x: 0.3, y: 0.4, z: 0.6 }, { x: 0.6, y: 3.9, z: 0.6 }],
      seats: [{ x: 2.3, y: 2.6, z: 1.1 }],
      openings: [{ wall: 'right', kind: 'open-doorway', from: 0.8, to: 1.8, bottom: 0, top: 2.05 }],
      treatments: [],
      speakerKinds: ['ported-rear', 'ported-rear'],
    }
    const f = setupFlags(bad)
    expect(f.length).toBeGreaterThan(5)
    const rank = { problem: 0, warning: 1, info: 2 }
    for (let i = 0; i < f.length; i++) {
      expect(SETUP_FLAG_IDS).toContain(f[i].id)
      expect(f[i].message).not.toMatch(/undefined|NaN|Infinity/)
      expect(f[i].message.length).toBeGreaterThan(60)
      if (i > 0) expect(rank[f[i].severity]).toBeGreaterThanOrEqual(rank[f[i - 1].severity])
    }
    expect(new Set(ids(f)).size).toBe(f.length)
  })
  it('does not mutate its input and rejects impossible input', () => {
    expect(() => setupFlags(deepFreeze(structuredClone({ ...good, openings: [{ wall: 'left' as const, kind: 'window', from: 1, to: 2, bottom: 1, top: 2 }] })))).not.toThrow()
    expect(() => setupFlags({ ...good, seats: [{ x: 7.2, y: 2, z: 1 }] })).toThrow('seat 1 lies outside the room: x = 7.2 m > length 5.9 m')
    expect(() => setupFlags({ ...good, openings: [{ wall: 'left', kind: 'window', from: 5, to: 6.5, bottom: 1, top: 2 }] })).toThrow(/opening 1 lies off the left wall/)
  })
})
