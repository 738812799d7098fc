import { describe, expect, it } from 'vitest'
import { bandReverberation, searchSubwoofers, subwooferLayoutResponse } from '../../../shared/acoustics'
import { predictPlan } from '../../../shared/plan'
import { planIssues } from '../../../shared/schemas/plan'
import { plan, planRoom } from './fixtures'

const room = { ...planRoom(), seats: [{ label: 'Sofa left', x: 3.4, y: 1.4, z: 1.1 }, { label: 'Sofa right', x: 3.4, y: 2.6, z: 1.1 }] }

describe("a plan's subwoofer item", () => {
  const box = { length: room.length, width: room.width, height: room.height }
  const rt = bandReverberation({ room: box, surfaces: room.surfaces, openings: room.openings, furnishings: room.furnishings, treatments: room.treatments, celsius: room.celsius ?? 20 })
  const opts = { rt60: rt.bands.map((b) => ({ hz: b.hz, seconds: b.eyring })), celsius: room.celsius ?? 20 }
  const best = searchSubwoofers(box, room.seats, { ...opts, counts: [2] }).best[0].layout

  it('predicts after = what the search promised for the adopted layout, before = the speakers playing the bass', () => {
    const p = predictPlan(room, plan({ subwooferLayout: { positions: best.positions, gainsDb: best.gainsDb, note: '' } }))
    expect(p.subwooferLayout).toBeDefined()
    expect(p.subwooferLayout!.after.seatToSeatDb).toBeCloseTo(best.seatToSeatDb, 2)
    expect(p.subwooferLayout!.after.meanSpreadDb).toBeCloseTo(best.meanSpreadDb, 2)
    const today = subwooferLayoutResponse(box, room.seats, { positions: room.speakers }, opts)
    expect(p.subwooferLayout!.beforeSources).toBe('speakers')
    expect(p.subwooferLayout!.before.seatToSeatDb).toBeCloseTo(today.seatToSeatDb, 2)
    expect(p.subwooferLayout!.seats.map((s) => s.label)).toEqual(['Sofa left', 'Sofa right'])
  })
  it('a plan without subwoofers has no subwoofer prediction; a level per subwoofer is required', () => {
    expect(predictPlan(room, plan({})).subwooferLayout).toBeUndefined()
    const body = plan({ subwooferLayout: { positions: best.positions, gainsDb: [0], note: '' } })
    expect(planIssues(body, room).map((i) => i.path)).toContain('subwooferLayout.gainsDb')
    const outside = plan({ subwooferLayout: { positions: [{ x: 1, y: 9, z: 0.3 }], gainsDb: [0], note: '' } })
    expect(planIssues(outside, room).map((i) => i.path)).toEqual(['subwooferLayout.positions.0.y'])
  })
})
