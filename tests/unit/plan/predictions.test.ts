import { describe, expect, it } from 'vitest'
import {
  computeRoomAnalysis, firstReflections, getMaterial, porousOctaveBands, speedOfSound, OCTAVE_BANDS_HZ,
} from '../../../shared/acoustics'
import { applyPlan, predictPlan, snapTargets, treatmentAbsorption, treatmentFromTarget } from '../../../shared/plan'
import { plan, planRoom } from './fixtures'

const room = planRoom()
const today = computeRoomAnalysis(room)
const pairL = today.reflections.find((p) => p.speaker === 'L')!
const leftL = pairL.first.find((r) => r.surface === 'left')!

/** 50 mm glass/rock wool 16 kg/m³ at 500, 1000, 2000 Hz: .80 .89 .97 (Bies, Hansen & Howard, Engineering Noise Control, Table 6.2; REFERENCES.md). */
const BIES_WOOL_MID = (0.8 + 0.89 + 0.97) / 3

describe('predictPlan — reflections', () => {
  const body = plan({
    treatments: [{ id: 'p1', type: 'panel', surface: 'left', materialId: 'mineral-wool-50mm-16kg', thickness: 0.05, width: 0.8, height: 0.6, x: leftL.point.x, y: 0, z: leftL.point.z }],
  })
  const p = predictPlan(room, body)
  const refl = p.reflections.find((r) => r.speaker === 'L' && r.surface === 'left')!

  it('a panel at a mirror point lowers that reflection by 10·log10((1 − α_panel)/(1 − α_wall)) — Allen & Berkley, JASA 65(4), 1979', () => {
    const wall = getMaterial('plaster-on-masonry').alpha
    const wallMid = ((wall[3] as number) + (wall[4] as number) + (wall[5] as number)) / 3
    expect(refl.afterDb - refl.beforeDb).toBeCloseTo(10 * Math.log10((1 - BIES_WOOL_MID) / (1 - wallMid)), 6)
    expect(refl.coveredBy).toEqual(['p1'])
  })
  it('the new level equals the contract firstReflections() with the panel’s α on that surface', () => {
    const seat = room.seats[0]
    const spk = room.speakers[0]
    const contract = firstReflections(room, spk, seat, { alpha: { left: BIES_WOOL_MID } }).find((r) => r.surface === 'left')!
    expect(refl.afterDb).toBeCloseTo(contract.levelDb, 6)
    expect(refl.delayMsAfter).toBeCloseTo(contract.delayMs, 9)
  })
  it('reflections the panel does not cover keep their level; the change lists what it covers', () => {
    const other = p.reflections.find((r) => r.speaker === 'R' && r.surface === 'left')!
    expect(other.afterDb).toBeCloseTo(other.beforeDb, 9)
    expect(other.coveredBy).toEqual([])
    const change = p.changes.find((c) => c.id === 'p1')!
    expect(change.covers.map((c) => `${c.speaker}:${c.surface}`)).toEqual(['L:left'])
    expect(change.summary).toContain(`${refl.beforeDb.toFixed(1)} dB → ${refl.afterDb.toFixed(1)} dB`)
    expect(change.absorption?.source).toContain('Bies, Hansen & Howard')
  })
})

describe('predictPlan — reverberation', () => {
  const area = 1.2 * 2.0
  const body = plan({ treatments: [{ id: 'trap', type: 'bass-trap', surface: 'back', materialId: 'rockwool-50mm-80kg', thickness: 0.05, width: 2.0, height: 1.2, x: 6.2, y: 2.2, z: 1.2 }] })
  const p = predictPlan(room, body)

  it('added absorption lowers Sabine RT as T = (24·ln10/c)·V/(A + 4mV) predicts (≈ 0.161·V/A) — Kuttruff, Room Acoustics, ch. 5', () => {
    const wall = getMaterial('plaster-on-masonry').alpha
    const trap = getMaterial('rockwool-50mm-80kg').alpha
    const k = (24 * Math.LN10) / speedOfSound(20)
    const v = 6.2 * 4.4 * 2.6
    for (const b of p.reverberation.bands) {
      const i = OCTAVE_BANDS_HZ.indexOf(b.hz as (typeof OCTAVE_BANDS_HZ)[number])
      const dA = area * ((trap[i] as number) - (wall[i] as number))
      expect(b.absorptionAfterM2 - b.absorptionBeforeM2).toBeCloseTo(dA, 9)
      expect(1 / b.sabineAfter - 1 / b.sabineBefore).toBeCloseTo(dA / (k * v), 9)
      expect(b.sabineAfter).toBeLessThan(b.sabineBefore)
    }
    // the rounded metric constant: within 0.1 % of 0.161 at 20 °C (c = 343.2 m/s)
    expect(k).toBeCloseTo(0.161, 3)
  })
  it('a porous-model treatment takes the engine’s Miki octave bands and names its flow resistivity', () => {
    const t = plan({ treatments: [{ id: 'pm', type: 'panel', surface: 'left', thickness: 0.1, airGap: 0.05, flowResistivity: 12_000, width: 1, height: 1, x: 2, y: 0, z: 1.2 }] }).treatments[0]
    const a = treatmentAbsorption(t)
    expect(a.alpha).toEqual(porousOctaveBands({ thickness: 0.1, flowResistivity: 12_000, airGap: 0.05, model: 'miki' }, OCTAVE_BANDS_HZ))
    expect(a.source).toMatch(/Miki.*flow resistivity 12,000 Pa·s\/m², 100 mm thick, over a 50 mm air gap/)
    expect(a.kind).toBe('porous')
  })
  it('a diffuser without a material row absorbs nothing: the reverberation stays as it was', () => {
    const d = predictPlan(room, plan({ treatments: [{ id: 'd1', type: 'diffuser', surface: 'back', thickness: 0.15, width: 1.2, height: 1.2, x: 6.2, y: 2.2, z: 1.3 }] }))
    for (const b of d.reverberation.bands) expect(b.sabineAfter).toBe(b.sabineBefore)
    expect(d.absorption[0].kind).toBe('none')
  })
})

describe('predictPlan — setup changes, flags and order', () => {
  it('moving the seat to the engine’s best centre-line position gives the spread the position search found', () => {
    const best = today.seat.positionSearch.seat.best
    const p = predictPlan(room, plan({ seat: best.point }))
    expect(p.after.spreadDb).toBeCloseTo(best.spreadDb, 6)
    expect(p.lowFrequency.spreadBeforeDb).toBeCloseTo(today.seat.modalResponse.spreadDb, 9)
    expect(p.changes[0].summary).toMatch(/Move the main seat/)
  })
  it('panels at all four side-wall mirror points clear the untreated-reflection flag', () => {
    const targets = snapTargets(room, today).filter((t) => t.kind === 'mirror' && (t.surface === 'left' || t.surface === 'right'))
    expect(targets).toHaveLength(4)
    const p = predictPlan(room, plan({ treatments: targets.map((t, i) => treatmentFromTarget(t, `side-${i}`)) }))
    expect(p.flags.before.map((f) => f.id)).toContain('untreated-first-reflections')
    expect(p.flags.cleared.map((f) => f.id)).toContain('untreated-first-reflections')
  })
  it('one corner trap raises the one-sided flag; its partner in the same plan clears it again and it is not held against either', () => {
    const t = snapTargets(room, today)
    const one = predictPlan(room, plan({ treatments: [treatmentFromTarget(t.find((x) => x.id === 'corner-front-left')!, 'c1')] }))
    expect(one.flags.raised.map((f) => f.id)).toContain('one-sided-corner-treatment')
    expect(one.changes[0].effect.parts.flags).toBeLessThan(0)
    const pair = predictPlan(room, plan({ treatments: ['corner-front-left', 'corner-front-right'].map((id, i) => treatmentFromTarget(t.find((x) => x.id === id)!, `c${i}`)) }))
    expect(pair.flags.raised.map((f) => f.id)).not.toContain('one-sided-corner-treatment')
    for (const c of pair.changes) expect(c.raisedFlags).not.toContain('one-sided-corner-treatment')
  })
  const t = snapTargets(room, today)
  const body = plan({
    seat: { x: 3.7, y: 2.2, z: 1.1 },
    treatments: [
      { id: 'rug', type: 'rug', surface: 'floor', materialId: 'carpet-thin-on-concrete', thickness: 0.01, width: 0.4, height: 0.4, x: 2.4, y: 1.6, z: 0 },
      treatmentFromTarget(t.find((x) => x.id === 'back-wall-behind-seat')!, 'back'),
      treatmentFromTarget(t.find((x) => x.id === 'mirror-L-left')!, 'side'),
    ],
  })
  const p = predictPlan(room, body)
  it('orders the changes by effect points, biggest first, each the sum of its documented parts', () => {
    const points = p.byEffect.map((id) => p.changes.find((c) => c.id === id)!.effect.points)
    expect([...points].sort((a, b) => b - a)).toEqual(points)
    expect(p.order).toEqual(p.byEffect)
    expect(p.byEffect[p.byEffect.length - 1]).toBe('rug')
    for (const c of p.changes) {
      const sum = c.effect.parts.reflections + c.effect.parts.bass + c.effect.parts.reverberation + c.effect.parts.flags
      expect(Math.abs(c.effect.points - sum)).toBeLessThan(0.21)
      expect(c.effect.parts.bass).toBeCloseTo(c.base.spreadDb - c.alone.spreadDb, 0)
      expect(c.effect.parts.reverberation).toBeCloseTo((c.base.rtExcessS - c.alone.rtExcessS) / 0.02, 0)
    }
  })
  it('treatments are scored on the room after the seat move; the last step equals the whole plan', () => {
    const back = p.changes.find((c) => c.id === 'back')!
    const seatOnly = computeRoomAnalysis(applyPlan(room, body, ['seat']))
    expect(back.base.spreadDb).toBeCloseTo(seatOnly.seat.modalResponse.spreadDb, 9)
    expect(p.steps[p.steps.length - 1].outcome).toEqual(p.after)
    expect(p.steps).toHaveLength(3 + 1)
  })
  it('the advisor’s order comes first, completed by effect', () => {
    const q = predictPlan(room, { ...body, order: ['rug'] })
    expect(q.order[0]).toBe('rug')
    expect(q.order.slice(1)).toEqual(q.byEffect.filter((id) => id !== 'rug'))
  })
  it('does not change the room or the plan it is given', () => {
    const r0 = JSON.stringify(room)
    const b0 = JSON.stringify(body)
    predictPlan(room, body)
    expect(JSON.stringify(room)).toBe(r0)
    expect(JSON.stringify(body)).toBe(b0)
  })
})
