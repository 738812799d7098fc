import type { PlanVersion } from '../../../shared/schemas/plan'
import { COLORS, pdfText, type Box, type Doc } from './pdf-doc'

/** The before/after charts: reverberation time per octave band and the low-frequency response at the seat. */

function axes(doc: Doc, b: Box, yTicks: number[], yOf: (v: number) => number, yLabel: (v: number) => string) {
  doc.lineWidth(0.4).strokeColor(COLORS.rule)
  for (const t of yTicks) {
    doc.moveTo(b.x, yOf(t)).lineTo(b.x + b.w, yOf(t)).stroke()
    doc.font('Helvetica').fontSize(7).fillColor(COLORS.muted).text(yLabel(t), b.x - 34, yOf(t) - 3.5, { width: 30, align: 'right', lineBreak: false })
  }
  doc.lineWidth(0.8).strokeColor(COLORS.room).moveTo(b.x, b.y).lineTo(b.x, b.y + b.h).lineTo(b.x + b.w, b.y + b.h).stroke()
}

function legend(doc: Doc, x: number, y: number, entries: [string, string][]) {
  let cx = x
  for (const [color, label] of entries) {
    doc.rect(cx, y, 10, 6).fill(color)
    doc.font('Helvetica').fontSize(7.5).fillColor(COLORS.ink).text(pdfText(label), cx + 13, y - 1, { lineBreak: false })
    cx += 20 + doc.widthOfString(pdfText(label)) + 10
  }
}

export function drawRtChart(doc: Doc, pr: PlanVersion['predictions'], outer: Box) {
  const b = { x: outer.x + 40, y: outer.y + 14, w: outer.w - 50, h: outer.h - 34 }
  const bands = pr.reverberation.bands
  if (!bands.length) return
  const max = Math.max(0.5, ...bands.flatMap((x) => [x.eyringBefore, x.eyringAfter, x.upper])) * 1.1
  const step = max > 2 ? 0.5 : max > 1 ? 0.25 : 0.1
  const ticks = Array.from({ length: Math.floor(max / step) + 1 }, (_, i) => i * step)
  const yOf = (v: number) => b.y + b.h - (v / max) * b.h
  axes(doc, b, ticks, yOf, (v) => `${v.toFixed(2)} s`)
  const slot = b.w / bands.length
  bands.forEach((band, i) => {
    const x0 = b.x + i * slot
    doc.save().fillOpacity(0.8).rect(x0 + 2, yOf(band.upper), slot - 4, yOf(band.lower) - yOf(band.upper)).fill(COLORS.band).restore()
    const bw = Math.min(18, slot / 3)
    doc.rect(x0 + slot / 2 - bw - 1, yOf(band.eyringBefore), bw, b.y + b.h - yOf(band.eyringBefore)).fill(COLORS.before)
    doc.rect(x0 + slot / 2 + 1, yOf(band.eyringAfter), bw, b.y + b.h - yOf(band.eyringAfter)).fill(COLORS.after)
    doc.font('Helvetica').fontSize(7).fillColor(COLORS.muted).text(band.hz >= 1000 ? `${band.hz / 1000}k` : String(band.hz), x0, b.y + b.h + 4, { width: slot, align: 'center', lineBreak: false })
  })
  doc.font('Helvetica').fontSize(7).fillColor(COLORS.muted).text('octave band, Hz', b.x, b.y + b.h + 13, { width: b.w, align: 'center', lineBreak: false })
  legend(doc, b.x, outer.y, [[COLORS.before, 'today'], [COLORS.after, 'after the plan'], [COLORS.band, 'target band']])
}

export function drawLfChart(doc: Doc, pr: PlanVersion['predictions'], outer: Box) {
  const b = { x: outer.x + 40, y: outer.y + 14, w: outer.w - 50, h: outer.h - 34 }
  const lf = pr.lowFrequency
  const idx = lf.freqsHz.map((f, i) => ({ f, i })).filter(({ f }) => f >= 20 && f <= 300)
  if (idx.length < 2) return
  const fMin = idx[0].f
  const fMax = idx[idx.length - 1].f
  const vals = idx.flatMap(({ i }) => [lf.beforeDb[i], lf.afterDb[i]]).filter(Number.isFinite)
  const lo = Math.floor(Math.min(...vals) / 5) * 5
  const hi = Math.ceil(Math.max(...vals) / 5) * 5
  const xOf = (f: number) => b.x + (Math.log(f / fMin) / Math.log(fMax / fMin)) * b.w
  const yOf = (v: number) => b.y + b.h - ((v - lo) / (hi - lo || 1)) * b.h
  const stepDb = hi - lo > 40 ? 10 : 5
  const ticks: number[] = []
  for (let v = lo; v <= hi; v += stepDb) ticks.push(v)
  axes(doc, b, ticks, yOf, (v) => `${v} dB`)
  doc.save().fillOpacity(0.5).rect(xOf(Math.max(fMin, lf.bandHz[0])), b.y, xOf(Math.min(fMax, lf.bandHz[1])) - xOf(Math.max(fMin, lf.bandHz[0])), b.h).fill('#f3f6f7').restore()
  for (const f of [20, 30, 40, 50, 60, 80, 100, 150, 200, 300].filter((f) => f >= fMin && f <= fMax)) {
    doc.lineWidth(0.3).strokeColor(COLORS.rule).moveTo(xOf(f), b.y).lineTo(xOf(f), b.y + b.h).stroke()
    doc.font('Helvetica').fontSize(7).fillColor(COLORS.muted).text(String(f), xOf(f) - 10, b.y + b.h + 4, { width: 20, align: 'center', lineBreak: false })
  }
  const line = (series: number[], color: string, width: number) => {
    let started = false
    for (const { f, i } of idx) {
      const v = series[i]
      if (!Number.isFinite(v)) continue
      if (!started) { doc.moveTo(xOf(f), yOf(v)); started = true } else doc.lineTo(xOf(f), yOf(v))
    }
    doc.lineWidth(width).strokeColor(color).stroke()
  }
  line(lf.beforeDb, COLORS.before, 1.2)
  line(lf.afterDb, COLORS.after, 1.6)
  doc.font('Helvetica').fontSize(7).fillColor(COLORS.muted).text('frequency, Hz', b.x, b.y + b.h + 13, { width: b.w, align: 'center', lineBreak: false })
  legend(doc, b.x, outer.y, [[COLORS.before, `today (spread ${lf.spreadBeforeDb.toFixed(1)} dB)`], [COLORS.after, `after the plan (spread ${lf.spreadAfterDb.toFixed(1)} dB)`]])
}
