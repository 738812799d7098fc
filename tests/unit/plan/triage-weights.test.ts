import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { triageScore } from '../../../server/services/triage'
import { prioritySql } from '../../../server/data/queue'

/*
 * The triage score's weights are our own definition (no published source; see server/services/triage.ts).
 * These checks test the ordering properties the definition promises, not numbers copied from the code:
 * a problem outweighs a warning, a warning a note; flags outweigh missing information item for item;
 * the flag part is capped; more flags never lower the score; waiting adds a quarter point an hour, capped at 96 h.
 */
const SEV = ['problem', 'warning', 'info'] as const
const arbFlags = fc.array(fc.constantFrom(...SEV).map((severity) => ({ severity })), { maxLength: 12 })
const arbInfo = fc.record({ measurements: fc.nat(3), photos: fc.nat(3), descriptionLength: fc.nat(400) })
const FULL = { measurements: 1, photos: 1, descriptionLength: 200 }

describe('triage score ordering (our own definition, no source)', () => {
  it('one problem outweighs one warning, which outweighs one note, for any other flags below the cap', () => {
    fc.assert(fc.property(arbFlags, arbInfo, (flags, info) => {
      const base = triageScore(flags, info).score
      const p = triageScore([...flags, { severity: 'problem' }], info).score
      const w = triageScore([...flags, { severity: 'warning' }], info).score
      const n = triageScore([...flags, { severity: 'info' }], info).score
      expect(p).toBeGreaterThanOrEqual(w)
      expect(w).toBeGreaterThanOrEqual(n)
      expect(n).toBeGreaterThanOrEqual(base)
      if (p - base === 10) { expect(p).toBeGreaterThan(w); expect(w).toBeGreaterThan(n) } // strict while under the cap
    }))
  })
  it('a single problem outweighs any one missing-information item, and a warning outweighs a missing photo', () => {
    const problem = triageScore([{ severity: 'problem' }], FULL).score
    for (const info of [{ ...FULL, measurements: 0 }, { ...FULL, photos: 0 }, { ...FULL, descriptionLength: 10 }]) {
      expect(problem).toBeGreaterThan(triageScore([], info).score)
    }
    expect(triageScore([{ severity: 'warning' }], FULL).score).toBeGreaterThan(triageScore([], { ...FULL, photos: 0 }).score)
  })
  it('a missing measurement counts more than a missing photo; missing information only adds', () => {
    expect(triageScore([], { ...FULL, measurements: 0 }).score).toBeGreaterThan(triageScore([], { ...FULL, photos: 0 }).score)
    fc.assert(fc.property(arbFlags, (flags) => {
      expect(triageScore(flags, { measurements: 0, photos: 0, descriptionLength: 0 }).score).toBeGreaterThan(triageScore(flags, FULL).score)
    }))
  })
  it('the flag part is capped, so piling on notes never beats a case with more information missing by more than the cap allows', () => {
    fc.assert(fc.property(arbFlags, arbInfo, (flags, info) => {
      const s = triageScore(flags, info)
      const flagPart = s.parts.find((x) => x.label === 'setup flags')!.points
      expect(flagPart).toBeLessThanOrEqual(40)
      expect(s.score).toBe(s.parts.reduce((a, x) => a + x.points, 0))
      expect(s.score).toBeLessThanOrEqual(40 + 6 + 3 + 3)
    }))
    expect(triageScore(Array(20).fill({ severity: 'problem' }), FULL).score).toBe(triageScore(Array(4).fill({ severity: 'problem' }), FULL).score)
  })
  it('queue priority: waiting adds hours/4 capped at 96 h (24 points), so four days of waiting outweigh two problems but not three (regression guard on the SQL expression)', () => {
    expect(prioritySql.replace(/\s+/g, ' ')).toMatch(/\+ least\(.*now\(\) - c\.waiting_since.*\/ 3600, 0\), 96\) \/ 4\)$/)
    const cap = 96 / 4
    const two = triageScore(Array(2).fill({ severity: 'problem' }), FULL).score
    const three = triageScore(Array(3).fill({ severity: 'problem' }), FULL).score
    expect(cap).toBeGreaterThan(two)
    expect(cap).toBeLessThan(three)
  })
})
