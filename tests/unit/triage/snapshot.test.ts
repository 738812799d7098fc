import { describe, expect, it } from 'vitest'
import { existsSync, readFileSync, writeFileSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { buildTriageSnapshot, triageScore } from '../../../server/services/triage'
import { demoRooms } from '../../../server/seed/rooms'
import { roomSchema } from '../../../shared/schemas/room'
import { computeRoomAnalysis } from '../../../shared/acoustics'
import { compareGolden } from '../../helpers/golden'

const FIXTURES = join(dirname(fileURLToPath(import.meta.url)), '../../fixtures/triage')
const AT = new Date('2026-11-20T10:00:00Z')
const INFO = { measurements: 0, photos: 1, descriptionLength: 140 }

describe('triage snapshots — golden fixtures of two invented demo rooms (regenerate on purpose with UPDATE_GOLDEN=1)', () => {
  for (const key of ['square', 'longWall'] as const) {
    it(`${key}: the stored snapshot is unchanged`, () => {
      const snapshot = buildTriageSnapshot(roomSchema.parse(demoRooms[key]), 3, INFO, AT)
      const file = join(FIXTURES, `${key}.snapshot.json`)
      if (process.env.UPDATE_GOLDEN === '1') writeFileSync(file, JSON.stringify(snapshot, null, 1) + '\n')
      expect(existsSync(file), `${file} is missing: run UPDATE_GOLDEN=1`).toBe(true)
      expect(compareGolden(JSON.parse(JSON.stringify(snapshot)), JSON.parse(readFileSync(file, 'utf8'))).slice(0, 10)).toEqual([])
    })
  }
})

describe('triage snapshot contents', () => {
  const room = roomSchema.parse(demoRooms.square)
  const snapshot = buildTriageSnapshot(room, 1, INFO, AT)
  it('flattens every first- and second-order reflection of every speaker–seat pair, each with its pair and window flag', () => {
    const a = computeRoomAnalysis(room)
    const expected = a.reflections.reduce((n, p) => n + p.first.length + p.second.length, 0)
    expect(snapshot.reflections).toHaveLength(expected)
    // six first-order image sources per pair (one per surface; Allen & Berkley)
    expect(snapshot.reflections.filter((r) => r.order === 1 && r.speaker === 'L')).toHaveLength(6)
    for (const r of snapshot.reflections) expect(r).toMatchObject({ speaker: expect.any(String), seat: 'Sofa middle', inWindow: expect.any(Boolean) })
  })
  it('the near-square demo room raises the near-square-plan flag and the score counts it', () => {
    expect(snapshot.flags.map((f) => f.id)).toContain('near-square-plan')
    expect(snapshot.score).toBe(triageScore(snapshot.flags, INFO).score)
  })
  it('scores: problems 10, warnings 4, notes 1 (capped at 40), plus missing information', () => {
    const flags = [{ severity: 'problem' }, { severity: 'warning' }, { severity: 'info' }]
    expect(triageScore(flags, { measurements: 1, photos: 1, descriptionLength: 200 }).score).toBe(15)
    expect(triageScore(flags, { measurements: 0, photos: 0, descriptionLength: 10 }).score).toBe(15 + 6 + 3 + 3)
    expect(triageScore(Array(9).fill({ severity: 'problem' }), { measurements: 1, photos: 1, descriptionLength: 200 }).score).toBe(40)
  })
})
