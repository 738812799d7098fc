import { describe, expect, it } from 'vitest'
import { computeRoomAnalysis } from '../../../shared/acoustics'
import { fitOnSurface, insideRect, snapTargets, treatmentFromTarget } from '../../../shared/plan'
import { planTreatmentSchema } from '../../../shared/schemas/plan'
import { planRoom } from './fixtures'

describe('snapTargets', () => {
  it('marks the image-source mirror points of the check room in REFERENCES.md: floor (4.5, 4, 0) and ceiling (4.5, 4, 4) — Allen & Berkley, JASA 65(4), 1979', () => {
    const room = planRoom({ length: 10, width: 8, height: 4, speakers: [{ label: 'A', x: 3, y: 4, z: 2 }, { label: 'B', x: 3, y: 6, z: 2 }], seats: [{ label: 'Seat', x: 6, y: 4, z: 2 }] })
    const t = snapTargets(room, computeRoomAnalysis(room))
    const floor = t.find((x) => x.id === 'mirror-A-floor')!
    const ceiling = t.find((x) => x.id === 'mirror-A-ceiling')!
    for (const [p, z] of [[floor.point, 0], [ceiling.point, 4]] as const) {
      expect(p.x).toBeCloseTo(4.5, 9)
      expect(p.y).toBeCloseTo(4, 9)
      expect(p.z).toBe(z)
    }
    expect(floor.suggestion.type).toBe('rug')
    expect(ceiling.suggestion.type).toBe('cloud')
  })

  const room = planRoom()
  const a = computeRoomAnalysis(room)
  const targets = snapTargets(room, a)

  it('every mirror target is the engine’s first-reflection point, with a rectangle at least the engine’s panel size that holds it', () => {
    const mirrors = targets.filter((t) => t.kind === 'mirror')
    expect(mirrors).toHaveLength(2 * 4)
    for (const t of mirrors) {
      const [, speaker, surface] = t.id.split('-')
      const r = a.reflections.find((p) => p.speaker === speaker)!.first.find((f) => f.surface === surface)!
      expect(t.point).toEqual(r.point)
      expect(t.widthM).toBeGreaterThanOrEqual(r.panel.widthM - 1e-9)
      expect(t.heightM).toBeGreaterThanOrEqual(r.panel.heightM - 1e-9)
      expect(insideRect(t.surface, r.point, { ...t.centre, width: t.widthM, height: t.heightM })).toBe(true)
      expect(t.reason).toContain(`${r.delayMs.toFixed(1)} ms`)
      expect(t.covers).toEqual([{ speaker, seat: 'Main seat', surface }])
    }
  })
  it('an invariant of the image method: a side-wall mirror point lies where the line from the mirrored speaker to the seat meets the wall', () => {
    const s = room.speakers[0]
    const r = room.seats[0]
    const t = targets.find((x) => x.id === 'mirror-L-left')!
    const u = s.y / (s.y + r.y)
    expect(t.point.x).toBeCloseTo(s.x + (r.x - s.x) * u, 9)
    expect(t.point.z).toBeCloseTo(s.z + (r.z - s.z) * u, 9)
    expect(t.point.y).toBe(0)
  })
  it('offers the four vertical corners (front first, corner traps), the back wall behind the seat and the wall behind each speaker', () => {
    const corners = targets.filter((t) => t.kind === 'corner')
    expect(corners.map((c) => [c.point.x, c.point.y])).toEqual([[0, 0], [0, 4.4], [6.2, 0], [6.2, 4.4]])
    for (const c of corners) {
      expect(c.suggestion.type).toBe('corner-trap')
      expect(c.heightM).toBeCloseTo(2.6, 9)
    }
    expect(corners[0].reason).toMatch(/front corners, as a pair/)
    const back = targets.find((t) => t.kind === 'back-wall')!
    expect(back.centre).toMatchObject({ x: 6.2, y: 2.2 })
    expect(back.suggestion.thickness).toBeGreaterThanOrEqual(0.15) // common practice, no source: back-wall traps 150 mm or more
    const fronts = targets.filter((t) => t.kind === 'front-wall')
    expect(fronts.map((f) => f.centre.y)).toEqual([1.2, 3.2])
    for (const f of fronts) expect(f.suggestion.thickness).toBeGreaterThanOrEqual(0.1) // common practice, no source
    expect(fronts[0].reason).toContain(`${Math.round(a.notches[0].notches.find((n) => n.surface === 'front')!.notchHz)} Hz`)
  })
  it('one ceiling target spans the ceiling reflections of both speakers', () => {
    const c = targets.find((t) => t.kind === 'ceiling')!
    for (const p of a.reflections) {
      const r = p.first.find((f) => f.surface === 'ceiling')!
      expect(insideRect('ceiling', r.point, { ...c.centre, width: c.widthM, height: c.heightM })).toBe(true)
    }
  })
  it('a treatment placed from a target is a valid plan treatment carrying the reason', () => {
    for (const t of targets) {
      const p = planTreatmentSchema.parse(treatmentFromTarget(t, 'x1'))
      expect(p.snap?.reason).toBe(t.reason)
      expect(p.surface).toBe(t.surface)
    }
  })
  it('fitOnSurface keeps a rectangle on its surface and shrinks one larger than it', () => {
    const f = fitOnSurface(room, 'left', { x: 0.1, y: 3, z: 2.5 }, 1, 0.6)
    expect(f.centre.x).toBeCloseTo(0.5, 12)
    expect(f.centre.y).toBe(0)
    expect(f.centre.z).toBeCloseTo(2.3, 12)
    expect(fitOnSurface(room, 'front', { x: 1, y: 2, z: 1 }, 9, 9)).toMatchObject({ width: 4.4, height: 2.6, centre: { x: 0, y: 2.2, z: 1.3 } })
  })
})
