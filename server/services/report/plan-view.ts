import type { Surface } from '../../../shared/acoustics'
import { COLORS, f2, pdfText, type Box, type Doc, type PlanPdfInput } from './pdf-doc'
import { badge, dimension } from './marks'

/** The room seen from above: walls, the 38 % guide, existing and planned treatments, seat and speakers. */
export function drawPlanView(doc: Doc, input: PlanPdfInput, stepOf: Map<string, number>, box: Box) {
  const { room, plan } = input
  const L = room.length
  const W = room.width
  const padL = 70
  const padT = 40
  const s = Math.min((box.w - padL - 40) / W, (box.h - padT - 40) / L)
  const ox = box.x + padL + (box.w - padL - 40 - W * s) / 2
  const oy = box.y + padT
  const px = (y: number) => ox + y * s
  const py = (x: number) => oy + x * s

  doc.lineWidth(1.6).strokeColor(COLORS.room).rect(px(0), py(0), W * s, L * s).stroke()
  doc.font('Helvetica').fontSize(8).fillColor(COLORS.muted)
  doc.text('front wall (behind the speakers)', px(0), py(0) - 32, { width: W * s, align: 'center' })
  doc.text('back wall', px(0), py(L) + 18, { width: W * s, align: 'center' })
  doc.save().rotate(-90, { origin: [px(0) - 14, py(L / 2)] }).text('left wall', px(0) - 14 - 40, py(L / 2) - 4, { width: 80, align: 'center' }).restore()
  doc.save().rotate(90, { origin: [px(W) + 26, py(L / 2)] }).text('right wall', px(W) + 26 - 40, py(L / 2) - 4, { width: 80, align: 'center' }).restore()
  dimension(doc, px(0), py(0) - 10, px(W), py(0) - 10, `width ${f2(W)} m`)
  dimension(doc, px(0) - 30, py(0), px(0) - 30, py(L), `length ${f2(L)} m`)

  // 38 % guide
  doc.save().dash(2, { space: 3 }).lineWidth(0.4).strokeColor(COLORS.rule)
  doc.moveTo(px(0), py(0.38 * L)).lineTo(px(W), py(0.38 * L)).stroke().undash().restore()
  doc.font('Helvetica').fontSize(6.5).fillColor(COLORS.muted).text('38 % of the length', px(0) + 3, py(0.38 * L) + 2, { lineBreak: false })

  const drawItem = (t: { surface: Surface; x: number; y: number; z: number; width: number; height: number; thickness: number }, existing: boolean, step?: number) => {
    const depth = Math.max(t.thickness * s, 3)
    const stroke = existing ? COLORS.existing : COLORS.treatment
    const fill = existing ? COLORS.existingFill : COLORS.treatmentFill
    let r: Box
    switch (t.surface) {
      case 'front': r = { x: px(t.y - t.width / 2), y: py(0), w: t.width * s, h: depth }; break
      case 'back': r = { x: px(t.y - t.width / 2), y: py(L) - depth, w: t.width * s, h: depth }; break
      case 'left': r = { x: px(0), y: py(t.x - t.width / 2), w: depth, h: t.width * s }; break
      case 'right': r = { x: px(W) - depth, y: py(t.x - t.width / 2), w: depth, h: t.width * s }; break
      default: r = { x: px(t.y - t.height / 2), y: py(t.x - t.width / 2), w: t.height * s, h: t.width * s }
    }
    doc.save()
    if (t.surface === 'floor' || t.surface === 'ceiling') doc.dash(t.surface === 'ceiling' ? 4 : 1.5, { space: 2 })
    doc.lineWidth(0.9).rect(r.x, r.y, r.w, r.h).fillOpacity(t.surface === 'floor' || t.surface === 'ceiling' ? 0.35 : 1).fillAndStroke(fill, stroke)
    doc.restore()
    if (step === undefined) return
    const cx = r.x + r.w / 2
    const cy = r.y + r.h / 2
    const off = t.surface === 'left' ? 12 : t.surface === 'right' ? -12 : 0
    const offY = t.surface === 'front' ? 12 : t.surface === 'back' ? -12 : 0
    badge(doc, cx + off, cy + offY, step)
    // dimensions from the walls to the item's edges
    if (t.surface === 'left' || t.surface === 'right') {
      const xw = t.surface === 'left' ? px(0) + 22 : px(W) - 22
      dimension(doc, xw, py(0), xw, py(t.x - t.width / 2), f2(t.x - t.width / 2), t.surface === 'left' ? 1 : -1)
    } else if (t.surface === 'front' || t.surface === 'back') {
      const yw = t.surface === 'front' ? py(0) + 22 : py(L) - 22
      const fromLeft = t.y - t.width / 2
      const fromRight = W - (t.y + t.width / 2)
      if (fromLeft <= fromRight) dimension(doc, px(0), yw, px(fromLeft), yw, f2(fromLeft), t.surface === 'front' ? 1 : -1)
      else dimension(doc, px(t.y + t.width / 2), yw, px(W), yw, f2(fromRight), t.surface === 'front' ? 1 : -1)
    } else {
      dimension(doc, r.x + r.w + 4, py(0), r.x + r.w + 4, r.y, f2(t.x - t.width / 2), 1)
      dimension(doc, px(0), r.y + r.h + 6, r.x, r.y + r.h + 6, f2(t.y - t.height / 2), 1)
    }
  }
  for (const t of room.treatments ?? []) drawItem(t, true)
  for (const t of plan.body.treatments) drawItem(t, false, stepOf.get(t.id))

  // seat and speakers: where they were (hollow) and where they go
  const seat0 = room.seats[0]
  const seat = plan.body.seat ?? seat0
  const moved = new Map(plan.body.speakers.map((s2) => [s2.label, s2]))
  for (const sp of room.speakers) {
    const to = moved.get(sp.label)
    if (to) {
      doc.save().dash(1.5, { space: 1.5 }).lineWidth(0.6).strokeColor(COLORS.speaker).rect(px(sp.y) - 5, py(sp.x) - 5, 10, 10).stroke().undash().restore()
      doc.moveTo(px(sp.y), py(sp.x)).lineTo(px(to.y), py(to.x)).lineWidth(0.6).strokeColor(COLORS.muted).stroke()
    }
    const p = to ?? sp
    doc.rect(px(p.y) - 5, py(p.x) - 5, 10, 10).fill(COLORS.speaker)
    doc.font('Helvetica-Bold').fontSize(7).fillColor(COLORS.ink).text(pdfText(sp.label), px(p.y) + 7, py(p.x) - 3, { lineBreak: false })
  }
  if (plan.body.seat) {
    doc.circle(px(seat0.y), py(seat0.x), 6).lineWidth(0.7).dash(1.5, { space: 1.5 }).strokeColor(COLORS.seat).stroke().undash()
    doc.moveTo(px(seat0.y), py(seat0.x)).lineTo(px(seat.y), py(seat.x)).lineWidth(0.6).strokeColor(COLORS.muted).stroke()
    doc.font('Helvetica').fontSize(6.5).fillColor(COLORS.muted).text('seat today', px(seat0.y) + 8, py(seat0.x) + 2, { lineBreak: false })
  }
  doc.circle(px(seat.y), py(seat.x), 6).fill(COLORS.seat)
  doc.font('Helvetica-Bold').fontSize(7).fillColor(COLORS.ink).text('main seat', px(seat.y) + 8, py(seat.x) - 9, { lineBreak: false })
  dimension(doc, px(seat.y) - 14, py(0), px(seat.y) - 14, py(seat.x), f2(seat.x), -1)
}

