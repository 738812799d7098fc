import { COLORS, type Doc } from './pdf-doc'

/** Marks shared by the report's drawings: a dimension line with its figure, a numbered step badge. */

export function dimension(doc: Doc, x1: number, y1: number, x2: number, y2: number, label: string, side: 1 | -1 = -1) {
  const horizontal = Math.abs(y2 - y1) < Math.abs(x2 - x1)
  if ((horizontal ? Math.abs(x2 - x1) : Math.abs(y2 - y1)) < 0.5) return
  doc.save().lineWidth(0.5).strokeColor(COLORS.muted)
  doc.moveTo(x1, y1).lineTo(x2, y2).stroke()
  const tick = 3
  if (horizontal) {
    doc.moveTo(x1, y1 - tick).lineTo(x1, y1 + tick).stroke()
    doc.moveTo(x2, y2 - tick).lineTo(x2, y2 + tick).stroke()
  } else {
    doc.moveTo(x1 - tick, y1).lineTo(x1 + tick, y1).stroke()
    doc.moveTo(x2 - tick, y2).lineTo(x2 + tick, y2).stroke()
  }
  doc.restore()
  doc.font('Helvetica').fontSize(7).fillColor(COLORS.muted)
  const w = doc.widthOfString(label)
  if (horizontal) doc.text(label, (x1 + x2) / 2 - w / 2, y1 + (side < 0 ? -9 : 2), { lineBreak: false })
  else doc.text(label, x1 + (side < 0 ? -w - 3 : 3), (y1 + y2) / 2 - 3.5, { lineBreak: false })
}

export function badge(doc: Doc, x: number, y: number, n: number | string) {
  doc.circle(x, y, 6).fill(COLORS.after)
  doc.font('Helvetica-Bold').fontSize(7).fillColor('#ffffff')
  const s = String(n)
  doc.text(s, x - doc.widthOfString(s) / 2, y - 3.2, { lineBreak: false })
}
