import { describe, expect, it } from 'vitest'
import { computeRoomAnalysis } from '../../../shared/acoustics'
import { placement, predictPlan, shoppingList, snapTargets, treatmentFromTarget } from '../../../shared/plan'
import type { PlanVersion } from '../../../shared/schemas/plan'
import { pdfText as sanitize, renderPlanPdf } from '../../../server/services/report-pdf'
import { plan, planRoom } from './fixtures'
import { pdfPageCount, pdfPathOps, pdfText } from './pdf-text'

const room = planRoom()

describe('placement and shopping list', () => {
  it('measures a wall item from the corners, the floor and the ceiling', () => {
    const p = placement(room, { surface: 'left', x: 2, y: 0, z: 1.2, width: 0.6, height: 0.6 })
    expect(p.from).toEqual({ name: 'front corner', m: 1.7 })
    expect(p.to).toEqual({ name: 'back corner', m: 3.9 })
    expect(p.low).toEqual({ name: 'floor', m: 0.9 })
    expect(p.high).toEqual({ name: 'ceiling', m: 1.1 })
    const c = placement(room, { surface: 'ceiling', x: 2.3, y: 2.2, z: 2.6, width: 1, height: 1.6 })
    expect(c.text).toBe('ceiling: 1.80 m from the front wall, 3.40 m from the back wall; 1.40 m from the left wall, 1.40 m from the right wall')
  })
  it('gathers identical items with their quantity and adds up the face area', () => {
    const body = plan({
      treatments: [
        { id: 'a', type: 'panel', surface: 'left', thickness: 0.05, width: 0.6, height: 1.2, x: 2, y: 0, z: 1.2 },
        { id: 'b', type: 'panel', surface: 'right', thickness: 0.05, width: 0.6, height: 1.2, x: 2, y: 4.4, z: 1.2 },
        { id: 'c', type: 'cloud', surface: 'ceiling', thickness: 0.05, airGap: 0.1, width: 1.2, height: 1.5, x: 2.3, y: 2.2, z: 2.6 },
      ],
    })
    const s = shoppingList(body.treatments)
    expect(s.items.map((i) => [i.item, i.quantity, i.changeIds])).toEqual([['Absorbing panel', 2, ['a', 'b']], ['Ceiling cloud', 1, ['c']]])
    expect(s.totalAreaM2).toBeCloseTo(2 * 0.72 + 1.8, 9)
    expect(s.totalCount).toBe(3)
    expect(s.items[1].size).toBe('1.20 × 1.50 m, 50 mm thick, 100 mm air gap')
  })
})

describe('renderPlanPdf', () => {
  const t = snapTargets(room, computeRoomAnalysis(room))
  const body = plan({
    seat: { x: 3.7, y: 2.2, z: 1.1 },
    notes: 'Start with the **back wall**; it matters most in this room.',
    treatments: [
      treatmentFromTarget(t.find((x) => x.id === 'mirror-L-left')!, 'side-l'),
      treatmentFromTarget(t.find((x) => x.id === 'mirror-R-right')!, 'side-r'),
      treatmentFromTarget(t.find((x) => x.id === 'corner-front-left')!, 'corner-l'),
      treatmentFromTarget(t.find((x) => x.id === 'corner-front-right')!, 'corner-r'),
      treatmentFromTarget(t.find((x) => x.id === 'ceiling-above-seat')!, 'cloud'),
    ],
  })
  const predictions = predictPlan(room, body)
  const version: PlanVersion = {
    caseId: '00000000-0000-4000-8000-000000000001', version: 3, status: 'sent', roomId: '00000000-0000-4000-8000-000000000002', roomRevision: 2,
    body, predictions, engineVersion: predictions.engineVersion, createdBy: { id: 'u', name: 'Ottilie Brandvold' },
    createdAt: '2025-03-04T10:00:00.000Z', sentAt: '2025-03-05T09:30:00.000Z', sentBy: { id: 'u', name: 'Ottilie Brandvold' },
  }
  const pdfP = renderPlanPdf({ plan: version, room, caseTitle: 'Flutter between the plaster walls', listenerName: 'Ansgar Quennell' })

  it('is a PDF of several A4 pages with the page count in every footer', async () => {
    const pdf = await pdfP
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-')
    const pages = pdfPageCount(pdf)
    expect(pages).toBeGreaterThanOrEqual(5)
    const text = pdfText(pdf)
    expect(text).toContain(`page ${pages} of ${pages}`)
  })
  it('holds the plan’s words: title, steps in order, notes, shopping list, follow-up measuring and every caution', async () => {
    const text = pdfText(await pdfP).replace(/\s+/g, ' ')
    for (const s of [
      'Flutter between the plaster walls', 'For Ansgar Quennell', 'plan version 3, sent 5 Mar 2025 by Ottilie Brandvold',
      'What to do, in this order', 'Start with the back wall', 'Shopping list', 'Total',
      'Measuring again after the changes', 'microphone at ear height at the main seat', 'pointing straight up',
      'moderate level', 'left speaker alone, then the right speaker alone, then both together',
      'fixings rated for the load', 'ceiling clouds', 'fire rating', 'building code', 'qualified electrician', 'defers to local building codes',
      'Where the absorption figures come from', 'Miki',
    ]) expect(text, s).toContain(s)
    predictions.order.forEach((id, i) => expect(text).toContain(`${i + 1}. ${predictions.changes.find((c) => c.id === id)!.title}`))
  })
  it('dimensions every treatment from the walls and corners, in the table and on the drawings', async () => {
    const text = pdfText(await pdfP).replace(/\s+/g, ' ')
    for (const tr of body.treatments) expect(text).toContain(placement(room, tr).text)
    const side = placement(room, body.treatments[0])
    expect(text).toContain(side.from.m.toFixed(2))
    expect(text).toContain('seen from above')
    expect(text).toContain('Left wall')
  })
  it('draws the room, the items and the charts as vector paths', async () => {
    const ops = pdfPathOps(await pdfP)
    expect(ops.re).toBeGreaterThan(40) // room outlines, treatments on plan and walls, chart bars, table fills
    expect(ops.l).toBeGreaterThan(300) // dimension lines, grid, the low-frequency curves
    expect(ops.S).toBeGreaterThan(50)
  })
  it('writes only characters the standard font carries', () => {
    expect(sanitize('−3.7 dB → −9.2 dB, α ≈ 0.9 ≤ 1, 2 m²')).toBe('-3.7 dB to -9.2 dB, alpha ~ 0.9 <= 1, 2 m²')
  })
})
