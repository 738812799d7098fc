import type { Surface } from '../../../shared/acoustics'
import { surfaceWords } from '../../../shared/plan'
import { COLORS, capital, f2, pdfText, type Box, type Doc, type PlanPdfInput } from './pdf-doc'
import { badge, dimension } from './marks'

/** Wall elevations as seen from inside: u runs along the wall from the drawing's left end. */
export function drawElevations(doc: Doc, input: PlanPdfInput, stepOf: Map<string, number>, box: Box): number {
  const { room, plan } = input
  const { length: L, width: W, height: H } = room
  const gap = 44
  const extra = 50
  const left = box.x + 30
  const usable = box.w - 30
  const s = Math.min(usable / L, (usable - gap) / (2 * W), (box.h - 3 * extra) / (3 * H))
  const row = (k: number) => box.y + 18 + k * (H * s + extra)
  const walls: { wall: Surface; ox: number; oy: number; span: number; flip: boolean; ends: [string, string] }[] = [
    { wall: 'left', ox: left, oy: row(0), span: L, flip: true, ends: ['back corner', 'front corner'] },
    { wall: 'right', ox: left, oy: row(1), span: L, flip: false, ends: ['front corner', 'back corner'] },
    { wall: 'front', ox: left, oy: row(2), span: W, flip: false, ends: ['left corner', 'right corner'] },
    { wall: 'back', ox: left + W * s + gap, oy: row(2), span: W, flip: true, ends: ['right corner', 'left corner'] },
  ]
  for (const w of walls) {
    const ux = (u: number) => w.ox + (w.flip ? w.span - u : u) * s
    const vz = (z: number) => w.oy + (H - z) * s
    doc.font('Helvetica-Bold').fontSize(8.5).fillColor(COLORS.ink).text(pdfText(`${capital(surfaceWords[w.wall])}`), w.ox, w.oy - 13, { lineBreak: false })
    doc.font('Helvetica').fontSize(6.5).fillColor(COLORS.muted)
    doc.text(w.ends[0], w.ox, w.oy + H * s + 4, { lineBreak: false })
    const e1 = w.ends[1]
    doc.text(e1, w.ox + w.span * s - doc.widthOfString(e1), w.oy + H * s + 4, { lineBreak: false })
    doc.lineWidth(1.2).strokeColor(COLORS.room).rect(w.ox, w.oy, w.span * s, H * s).stroke()
    for (const o of (room.openings ?? []).filter((o) => o.wall === w.wall)) {
      const x1 = ux(o.from)
      const x2 = ux(o.to)
      doc.save().lineWidth(0.6).dash(2, { space: 2 }).strokeColor(COLORS.muted).rect(Math.min(x1, x2), vz(o.top), Math.abs(x2 - x1), (o.top - o.bottom) * s).stroke().restore()
      doc.font('Helvetica').fontSize(6).fillColor(COLORS.muted).text(pdfText(o.kind), Math.min(x1, x2) + 2, vz(o.top) + 2, { lineBreak: false })
    }
    const along = (t: { x: number; y: number }) => (w.wall === 'front' || w.wall === 'back' ? t.y : t.x)
    for (const t of (room.treatments ?? []).filter((t) => t.surface === w.wall)) {
      const a = ux(along(t) - t.width / 2)
      const b = ux(along(t) + t.width / 2)
      doc.lineWidth(0.6).rect(Math.min(a, b), vz(t.z + t.height / 2), Math.abs(b - a), t.height * s).fillAndStroke(COLORS.existingFill, COLORS.existing)
    }
    const items = plan.body.treatments.filter((t) => t.surface === w.wall)
    items.forEach((t, k) => {
      const u0 = along(t) - t.width / 2
      const u1 = along(t) + t.width / 2
      const a = ux(u0)
      const b = ux(u1)
      const left = Math.min(a, b)
      const top = vz(t.z + t.height / 2)
      doc.lineWidth(0.9).rect(left, top, Math.abs(b - a), t.height * s).fillAndStroke(COLORS.treatmentFill, COLORS.treatment)
      const step = stepOf.get(t.id)
      if (step !== undefined) badge(doc, left + Math.abs(b - a) / 2, top + t.height * s / 2, step)
      // along the floor from the reference corner (u = 0) to the near edge, staggered per item
      const yDim = vz(0) + 18 + (k % 3) * 9
      dimension(doc, ux(0), yDim, ux(u0), yDim, f2(u0), 1)
      // floor to the bottom edge
      const bottomZ = t.z - t.height / 2
      const xDim = left + Math.abs(b - a) + 5
      if (bottomZ > 0.005) dimension(doc, xDim, vz(0), xDim, vz(bottomZ), f2(bottomZ), 1)
      doc.font('Helvetica').fontSize(6.5).fillColor(COLORS.ink)
      const sizeLabel = `${f2(t.width)} × ${f2(t.height)}`
      doc.text(pdfText(sizeLabel), left + 2, t.height * s > 24 ? top + 3 : top - 8, { lineBreak: false })
    })
    dimension(doc, w.ox - 8, vz(0), w.ox - 8, vz(H), f2(H), -1)
  }
  return row(3) - extra + 44
}
