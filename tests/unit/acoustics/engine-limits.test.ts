import { describe, expect, it } from 'vitest'
import { modeCountEstimate, roomModes } from '../../../shared/acoustics'
import { engineLimitIssues, MODAL_SUM_HZ, ROOM_LIMITS, roomSchema } from '../../../shared/schemas/room'
import { hardestAcceptedRoom, largestAcceptedRoom } from '../../fixtures/worst-rooms'

describe('engine limits (ROOM_LIMITS, engineLimitIssues)', () => {
  it('the closed-form mode count the limits use matches the exact count within 2 % for the worst accepted rooms (Kuttruff, Room Acoustics: N(f) ≈ 4πVf³/3c³ + πSf²/4c² + Lf/8c)', () => {
    for (const r of [largestAcceptedRoom(), hardestAcceptedRoom()]) {
      const exact = roomModes(r, { maxHz: MODAL_SUM_HZ }).length
      expect(Math.abs(modeCountEstimate(r, MODAL_SUM_HZ) - exact) / exact).toBeLessThan(0.02)
    }
  })
  it('the worst accepted rooms pass the schema and every limit', () => {
    for (const r of [largestAcceptedRoom(), hardestAcceptedRoom()]) expect(engineLimitIssues(roomSchema.parse(r))).toEqual([])
    expect(modeCountEstimate(largestAcceptedRoom(), MODAL_SUM_HZ)).toBeGreaterThan(0.95 * ROOM_LIMITS.summedModes)
  })
  it('a small room of bare ceramic tiles is refused for its mode table length', () => {
    const tiles = { ...hardestAcceptedRoom(), length: 4, width: 3.5, height: 2.5, surfaces: Object.fromEntries(['front', 'back', 'left', 'right', 'floor', 'ceiling'].map((s) => [s, 'ceramic-tiles'])) }
    const issues = engineLimitIssues(roomSchema.parse(tiles))
    expect(issues.map((i) => i.limit)).toEqual(['listedModes'])
    expect(issues[0].value).toBeGreaterThan(ROOM_LIMITS.listedModes)
  })
})
