import { existsSync, readFileSync, writeFileSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import type { RoomDescription } from '../../../shared/acoustics'
import { ENGINE_VERSION, computeRoomAnalysis, inReflectionWindow, roomModes } from '../../../shared/acoustics'
import { deepFreeze } from './helpers'
import { compareGolden } from '../../helpers/golden'

const FIXTURES = join(dirname(fileURLToPath(import.meta.url)), '../../fixtures/engine')
const ROOMS = ['den', 'loft', 'basement'] as const
const load = (name: string): RoomDescription => JSON.parse(readFileSync(join(FIXTURES, `${name}.input.json`), 'utf8'))

const compare = compareGolden

describe('computeRoomAnalysis — golden fixtures (three invented rooms; regenerate on purpose with UPDATE_GOLDEN=1)', () => {
  for (const name of ROOMS) {
    it(`${name}: matches tests/fixtures/engine/${name}.expected.json`, () => {
      const out = JSON.parse(JSON.stringify(computeRoomAnalysis(load(name))))
      const file = join(FIXTURES, `${name}.expected.json`)
      if (process.env.UPDATE_GOLDEN === '1') writeFileSync(file, JSON.stringify(out, null, 1) + '\n')
      expect(existsSync(file), `${file} is missing: run UPDATE_GOLDEN=1 npx vitest run tests/unit/acoustics`).toBe(true)
      const diffs = compare(out, JSON.parse(readFileSync(file, 'utf8')))
      expect(diffs.slice(0, 10)).toEqual([])
    })
  }
})

describe('computeRoomAnalysis', () => {
  const desc = load('den')
  const a = computeRoomAnalysis(desc)
  it('lists modes up to max(300 Hz, 2 × Schroeder frequency), as roomModes does', () => {
    expect(a.engineVersion).toBe(ENGINE_VERSION)
    expect(a.modesMaxHz).toBe(Math.max(300, 2 * a.reverberation.schroederHz))
    expect(a.modes).toEqual(roomModes(desc, { maxHz: a.modesMaxHz, celsius: 21 }))
  })
  it('gives first- and second-order reflections per speaker–seat pair with a consistent inWindow', () => {
    expect(a.reflections).toHaveLength(desc.speakers.length * desc.seats.length)
    for (const p of a.reflections) {
      expect(p.first.map((f) => f.surface)).toEqual(['front', 'back', 'left', 'right', 'floor', 'ceiling'])
      expect(p.second).toHaveLength(18)
      for (const f of [...p.first, ...p.second]) expect(f.inWindow).toBe(inReflectionWindow(f))
      expect(p.inWindowCount).toBe([...p.first, ...p.second].filter((f) => f.inWindow).length)
    }
    // the left speaker's left-wall reflection for the main seat lands on the window
    expect(a.reflections[0].first.find((f) => f.surface === 'left')!.hit.via).toBe('opening')
  })
  it('honours a settable reflection window', () => {
    const b = computeRoomAnalysis(desc, { reflectionWindow: { windowMs: 5, thresholdDb: -3 } })
    expect(b.reflectionWindow).toEqual({ windowMs: 5, thresholdDb: -3 })
    for (const p of b.reflections) for (const f of p.first) expect(f.inWindow).toBe(f.delayMs <= 5 && f.levelDb > -3)
  })
  it('gives notches per speaker, reverberation per band with targets, flags and the main seat', () => {
    expect(a.notches.map((n) => n.speaker)).toEqual(['L', 'R'])
    expect(a.notches[0].notches).toHaveLength(6)
    expect(a.reverberation.bands.map((b) => b.hz)).toEqual([125, 250, 500, 1000, 2000, 4000])
    expect(a.reverberation.targets.bs1116.bands).toHaveLength(6)
    expect(a.flags.length).toBeGreaterThan(0)
    expect(a.seat.label).toBe('sofa middle')
    expect(a.seat.positionSearch.seat.scan).toHaveLength(200)
    expect(a.seat.modalResponse.spreadDb).toBeCloseTo(a.seat.positionSearch.seat.current.spreadDb, 9)
  })
  it('uses subwoofers as the bass sources when present and accepts the room-schema field names (width/height, area)', () => {
    const loft = computeRoomAnalysis(load('loft'))
    expect(loft.seat.bassSources).toEqual(['Sub'])
    expect(loft.notches.map((n) => n.speaker)).toEqual(['Left', 'Right', 'Sub'])
    expect(loft.flags.map((f) => f.id)).toContain('facing-long-wall')
    expect(loft.reflections[0].first.find((f) => f.surface === 'left')!.hit.via).toBe('treatment')
  })
  it('produces plain JSON: no NaN or infinite numbers', () => {
    for (const name of ROOMS) {
      const walk = (v: unknown): void => {
        if (typeof v === 'number') expect(Number.isFinite(v)).toBe(true)
        else if (v && typeof v === 'object') Object.values(v).forEach(walk)
      }
      walk(computeRoomAnalysis(load(name)))
    }
  })
  it('does not mutate its input', () => {
    const frozen = deepFreeze(load('loft'))
    const before = JSON.stringify(frozen)
    computeRoomAnalysis(frozen)
    expect(JSON.stringify(frozen)).toBe(before)
  })
  it('rejects impossible rooms with a RangeError naming the value', () => {
    expect(() => computeRoomAnalysis({ ...desc, length: -5.8 })).toThrow('room length must be greater than zero: got -5.8 m')
    expect(() => computeRoomAnalysis({ ...desc, seats: [{ label: 'bar stool', x: 7.2, y: 2, z: 1 }] })).toThrow("seat 'bar stool' lies outside the room: x = 7.2 m > length 5.8 m")
    expect(() => computeRoomAnalysis({ ...desc, openings: [{ wall: 'back', kind: 'door', from: 3.5, to: 4.5, bottom: 0, top: 2 }] })).toThrow(/opening 1 lies off the back wall/)
    expect(() => computeRoomAnalysis({ ...desc, surfaces: { ...desc.surfaces, ceiling: 'cork' } })).toThrow("unknown ceiling material id 'cork'")
  })
})
