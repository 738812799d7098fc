import PDFDocument from 'pdfkit'
import type { Surface } from '../../shared/acoustics'
import { CAUTIONS, FOLLOW_UP_MEASURING, placement, shoppingList, surfaceWords, treatmentTypeNames } from '../../shared/plan'
import type { PlanRoom } from '../../shared/plan'
import type { PlanVersion } from '../../shared/schemas/plan'
import { formatDate } from '../../shared/words/dates'

/**
 * The plan as a PDF the listener can keep: A4, pdfkit's standard Helvetica (text stays searchable),
 * drawings and charts as vector paths. Sections: summary and steps, room drawings (plan view and
 * the four walls, every treatment dimensioned from the walls and corners), before/after charts and
 * the reflection table, the shopping list, absorption sources, follow-up measuring, cautions.
 */

export interface PlanPdfInput {
  plan: PlanVersion
  room: PlanRoom & { name?: string }
  caseTitle: string
  listenerName: string
}

type Doc = InstanceType<typeof PDFDocument>

const A4 = { w: 595.28, h: 841.89 }
const MARGIN = 48
const CONTENT_W = A4.w - 2 * MARGIN
const COLORS = {
  ink: '#1d2327', muted: '#5c646b', rule: '#c9cfd4', room: '#3b4449', before: '#9aa3aa', after: '#0f6b6f',
  treatment: '#0f6b6f', treatmentFill: '#d5ecec', existing: '#b9a98f', existingFill: '#efe8dc', target: '#e8f0f0', seat: '#b5462f', speaker: '#1d2327', band: '#f1e7c9',
}

/** Helvetica carries WinAnsi only: other characters get plain equivalents. */
export function pdfText(s: string): string {
  return s
    .replace(/\u2212/g, '-')
    .replace(/\s*\u2192\s*/g, ' to ')
    .replace(/\u2264/g, '<=')
    .replace(/\u2265/g, '>=')
    .replace(/\u2248/g, '~')
    .replace(/\u03b1/g, 'alpha')
    .replace(/\u03c3/g, 'sigma')
    .replace(/\u2009|\u202f/g, ' ')
    .replace(/[^\u0000-\u00ff\u0152\u0153\u0160\u0161\u0178\u017d\u017e\u0192\u02c6\u02dc\u2013\u2014\u2018-\u201a\u201c-\u201e\u2020-\u2022\u2026\u2030\u2039\u203a\u20ac\u2122]/g, '?')
}

/** Markdown reduced to plain paragraphs for print (headings, emphasis and list markers dropped). */
export function plainMarkdown(md: string): string[] {
  return md
    .split(/\n{2,}/)
    .map((p) => p.replace(/^#{1,6}\s*/gm, '').replace(/\*\*(.+?)\*\*/g, '$1').replace(/[*_`]/g, '').replace(/^\s*[-+]\s+/gm, '• ').replace(/\[(.+?)\]\((.+?)\)/g, '$1 ($2)').trim())
    .filter(Boolean)
}

const f2 = (v: number) => v.toFixed(2)

export async function renderPlanPdf(input: PlanPdfInput): Promise<Buffer> {
  const { plan, room } = input
  const pr = plan.predictions
  const doc: Doc = new PDFDocument({
    size: 'A4',
    margins: { top: MARGIN, bottom: MARGIN + 14, left: MARGIN, right: MARGIN },
    bufferPages: true,
    info: { Title: pdfText(`Treatment plan: ${input.caseTitle}`), Author: 'Roomwright', Subject: `Plan version ${plan.version}` },
  })
  const chunks: Buffer[] = []
  doc.on('data', (c: Buffer) => chunks.push(c))
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })

  const text = (s: string, opts: PDFKit.Mixins.TextOptions = {}) => doc.text(pdfText(s), opts)
  const heading = (s: string) => {
    ensureSpace(60)
    doc.moveDown(0.6).font('Helvetica-Bold').fontSize(14).fillColor(COLORS.ink)
    text(s, { width: CONTENT_W })
    doc.moveDown(0.3).font('Helvetica').fontSize(10)
  }
  const sub = (s: string) => {
    ensureSpace(40)
    doc.moveDown(0.4).font('Helvetica-Bold').fontSize(11).fillColor(COLORS.ink)
    text(s, { width: CONTENT_W })
    doc.moveDown(0.15).font('Helvetica').fontSize(10)
  }
  const para = (s: string, opts: PDFKit.Mixins.TextOptions = {}) => {
    doc.font('Helvetica').fontSize(10).fillColor(COLORS.ink)
    text(s, { width: CONTENT_W, lineGap: 1.5, ...opts })
    doc.moveDown(0.35)
  }
  const bottom = () => A4.h - MARGIN - 14
  function ensureSpace(h: number) {
    if (doc.y + h > bottom()) doc.addPage()
  }

  const stepOf = new Map(pr.order.map((id, i) => [id, i + 1]))
  const changeOf = new Map(pr.changes.map((c) => [c.id, c]))
  const sentWords = plan.sentAt
    ? `sent ${formatDate(plan.sentAt, { timeZone: 'UTC' })}${plan.sentBy ? ` by ${plan.sentBy.name}` : ''}`
    : 'draft, not yet sent'

  // ---------------------------------------------------------------- page 1: summary and steps
  doc.rect(0, 0, A4.w, 70).fill(COLORS.after)
  doc.fillColor('#ffffff').font('Helvetica-Bold').fontSize(20).text('Roomwright', MARGIN, 22)
  doc.font('Helvetica').fontSize(11).text(pdfText('Treatment plan'), MARGIN, 46)
  doc.fillColor(COLORS.ink).font('Helvetica-Bold').fontSize(16)
  doc.y = 92
  text(input.caseTitle, { width: CONTENT_W })
  doc.font('Helvetica').fontSize(10).fillColor(COLORS.muted)
  text(`For ${input.listenerName} · plan version ${plan.version}, ${sentWords} · room${room.name ? ` "${room.name}"` : ''} ${f2(room.length)} × ${f2(room.width)} × ${f2(room.height)} m (${pr.reverberation.volumeM3.toFixed(1)} m³), revision ${plan.roomRevision}`, { width: CONTENT_W })
  doc.moveDown(0.8)

  sub('At your main seat: today and after the plan (predicted)')
  table(doc, [
    { title: '', width: 200 },
    { title: 'Today', width: 66, align: 'right' },
    { title: 'After the plan', width: 80, align: 'right' },
    { title: 'Aim', width: CONTENT_W - 346, align: 'right' },
  ], [
    ['Bass: peak-to-dip spread (smoothed)', `${pr.before.spreadDb.toFixed(1)} dB`, `${pr.after.spreadDb.toFixed(1)} dB`, '5-6 dB is about the best a room gets'],
    ['Strong early reflections (first order)', String(pr.before.firstInWindow), String(pr.after.firstInWindow), `none within ${pr.reflectionWindow.windowMs} ms above ${pr.reflectionWindow.thresholdDb} dB`],
    ['Reverberation time, 500 Hz-1 kHz (Eyring)', `${pr.before.rtMidS.toFixed(2)} s`, `${pr.after.rtMidS.toFixed(2)} s`, pr.rtTarget.rule === 'bs1116' ? 'ITU-R BS.1116 band' : 'about 0.3 s (0.2-0.4 s)'],
    ['Setup issues (problems and warnings)', String(pr.before.problems + pr.before.warnings), String(pr.after.problems + pr.after.warnings), 'none'],
  ])
  doc.font('Helvetica').fontSize(8.5).fillColor(COLORS.muted)
  text(`Predicted by the Roomwright room engine ${pr.engineVersion} from the room you described; aims marked as common practice have no published source. The first reflections and bass figures are for the main seat.`, { width: CONTENT_W })
  doc.moveDown(0.6)

  heading('What to do, in this order')
  para('Each step is listed with what it should change at your seat. The order puts the biggest effect first, because each fix uncovers the next problem; the effect measure is explained at the end of the plan.', { lineGap: 1 })
  pr.order.forEach((id, i) => {
    const c = changeOf.get(id)
    if (!c) return
    ensureSpace(70)
    doc.font('Helvetica-Bold').fontSize(11).fillColor(COLORS.after)
    text(`${i + 1}. ${c.title}`, { width: CONTENT_W })
    doc.font('Helvetica').fontSize(9.5).fillColor(COLORS.ink)
    text(c.summary, { width: CONTENT_W, lineGap: 1 })
    const note = id === 'seat' ? plan.body.seatNote : id === 'speakers' ? plan.body.speakersNote : id === 'subwoofers' ? plan.body.subwoofersNote : plan.body.treatments.find((t) => t.id === id)?.note
    if (note?.trim()) {
      doc.fillColor(COLORS.muted).font('Helvetica-Oblique')
      text(`Advisor: ${note.trim()}`, { width: CONTENT_W })
      doc.font('Helvetica')
    }
    doc.fillColor(COLORS.muted).fontSize(8.5)
    text(`Effect ${c.effect.points.toFixed(1)} points (reflections ${c.effect.parts.reflections}, bass ${c.effect.parts.bass}, reverberation ${c.effect.parts.reverberation}, setup flags ${c.effect.parts.flags})`, { width: CONTENT_W })
    doc.moveDown(0.5)
  })
  if (!pr.order.length) para('This version lists no changes yet.')

  if (plan.body.notes.trim()) {
    heading('Notes from your advisor')
    for (const p of plainMarkdown(plan.body.notes)) para(p)
  }

  // ---------------------------------------------------------------- drawings
  doc.addPage()
  heading('The room seen from above')
  para('Front wall (behind the speakers) at the top, left wall on the left as seen from the seat. Plan items are numbered by their step; dimensions in metres to the edges of each item from the nearest walls. Existing treatment in beige; dashed outlines hang from the ceiling or lie on the floor.', { lineGap: 1 })
  drawPlanView(doc, input, stepOf, { x: MARGIN, y: doc.y + 6, w: CONTENT_W, h: bottom() - doc.y - 16 })

  doc.addPage()
  heading('The walls, as seen from inside the room')
  para('Each wall is drawn as you see it standing in the room facing it. Dimensions in metres: along the floor from the named corner to the item\'s edge, and from the floor to its bottom edge.', { lineGap: 1 })
  doc.y = drawElevations(doc, input, stepOf, { x: MARGIN, y: doc.y + 4, w: CONTENT_W, h: Math.min(560, bottom() - doc.y - 8) })
  doc.x = MARGIN

  sub('Where each item goes')
  const placed = plan.body.treatments.map((t) => ({ t, step: stepOf.get(t.id) ?? 0 })).sort((a, b) => a.step - b.step)
  table(doc, [
    { title: 'Step', width: 34 },
    { title: 'Item', width: 110 },
    { title: 'Size', width: 86 },
    { title: 'Position, measured from walls and corners', width: CONTENT_W - 230 },
  ], placed.map(({ t, step }) => [
    String(step),
    treatmentTypeNames[t.type] ?? t.type,
    `${f2(t.width)} × ${f2(t.height)} m${t.thickness ? `, ${Math.round(t.thickness * 1000)} mm` : ''}`,
    placement(room, t).text,
  ]))
  if (!placed.length) para('No treatments in this version.')
  const moves: string[][] = []
  if (plan.body.seat) moves.push([String(stepOf.get('seat') ?? ''), 'Main seat', `${f2(plan.body.seat.x)} m from the front wall, ${f2(plan.body.seat.y)} m from the left wall, ears ${f2(plan.body.seat.z)} m above the floor (was ${f2(room.seats[0].x)} m, ${f2(room.seats[0].y)} m)`])
  for (const s of plan.body.speakers) {
    const was = room.speakers.find((x) => x.label === s.label)
    moves.push([String(stepOf.get('speakers') ?? ''), `Speaker ${s.label}`, `front of the cabinet's acoustic centre ${f2(s.x)} m from the front wall, ${f2(s.y)} m from the left wall, ${f2(s.z)} m high${was ? ` (was ${f2(was.x)} m, ${f2(was.y)} m)` : ''}`])
  }
  for (const s of plan.body.subwoofers ?? []) {
    const was = (room.subwoofers ?? []).find((x) => x.label === s.label)
    moves.push([String(stepOf.get('subwoofers') ?? ''), `Subwoofer ${s.label}`, `${f2(s.x)} m from the front wall, ${f2(s.y)} m from the left wall, ${f2(s.z)} m high${was ? ` (was ${f2(was.x)} m, ${f2(was.y)} m)` : ''}`])
  }
  if (moves.length) {
    sub('Seat and speaker positions')
    table(doc, [{ title: 'Step', width: 34 }, { title: 'What', width: 90 }, { title: 'New position', width: CONTENT_W - 124 }], moves)
  }

  // ---------------------------------------------------------------- charts
  doc.addPage()
  heading('Before and after (predicted)')
  sub('Reverberation time per octave band')
  para(`Eyring reverberation time from the surfaces, furnishings, air and the plan's treatments, today (grey) and after the plan (teal); the shaded band is the target: ${pr.rtTarget.description}.`, { lineGap: 1 })
  drawRtChart(doc, pr, { x: MARGIN, y: doc.y + 4, w: CONTENT_W, h: 190 })
  doc.y += 206
  table(doc, [
    { title: 'Band', width: 60 },
    { title: 'Sabine today', width: 80, align: 'right' },
    { title: 'Sabine after', width: 80, align: 'right' },
    { title: 'Eyring today', width: 80, align: 'right' },
    { title: 'Eyring after', width: 80, align: 'right' },
    { title: 'Target', width: CONTENT_W - 380, align: 'right' },
  ], pr.reverberation.bands.map((b) => [`${b.hz} Hz`, `${f2(b.sabineBefore)} s`, `${f2(b.sabineAfter)} s`, `${f2(b.eyringBefore)} s`, `${f2(b.eyringAfter)} s`, `${f2(b.lower)}-${f2(b.upper)} s`]))

  ensureSpace(260)
  sub('Low-frequency response at the main seat')
  para(`The modal sum at the seat, smoothed to 1/6 octave, today (grey) and after the plan (teal). Peak-to-dip spread in ${pr.lowFrequency.bandHz[0]}-${pr.lowFrequency.bandHz[1]} Hz: ${pr.lowFrequency.spreadBeforeDb.toFixed(1)} dB today, ${pr.lowFrequency.spreadAfterDb.toFixed(1)} dB after.`, { lineGap: 1 })
  drawLfChart(doc, pr, { x: MARGIN, y: doc.y + 4, w: CONTENT_W, h: 190 })
  doc.y += 206

  heading('Early reflections at the main seat')
  para(`First-order reflections from each speaker. Inside the window means within ${pr.reflectionWindow.windowMs} ms of the direct sound and louder than ${pr.reflectionWindow.thresholdDb} dB relative to it (common practice, no source). Covered by: the plan items whose rectangle holds the reflection point.`, { lineGap: 1 })
  const main = plan.predictions.reflections.filter((r) => r.seat === room.seats[0].label)
  table(doc, [
    { title: 'Speaker', width: 54 },
    { title: 'Surface', width: 76 },
    { title: 'Delay', width: 56, align: 'right' },
    { title: 'Today', width: 60, align: 'right' },
    { title: 'After', width: 60, align: 'right' },
    { title: 'In window', width: 80 },
    { title: 'Covered by step', width: CONTENT_W - 386 },
  ], main.map((r) => [
    r.speaker, surfaceWords[r.surface], `${r.delayMsAfter.toFixed(1)} ms`, `${r.beforeDb.toFixed(1)} dB`, `${r.afterDb.toFixed(1)} dB`,
    `${r.inWindowBefore ? 'yes' : 'no'} to ${r.inWindowAfter ? 'yes' : 'no'}`, r.coveredBy.map((id) => stepOf.get(id) ?? id).join(', '),
  ]))

  if (pr.flags.cleared.length || pr.flags.raised.length) {
    sub('Setup flags')
    for (const f of pr.flags.cleared) para(`Clears: ${f.message}`)
    for (const f of pr.flags.raised) para(`New: ${f.message}`)
  }

  // ---------------------------------------------------------------- shopping list and sources
  heading('Shopping list')
  const shop = shoppingList(plan.body.treatments)
  table(doc, [
    { title: 'Qty', width: 30, align: 'right' },
    { title: 'Item', width: 100 },
    { title: 'Size', width: 130 },
    { title: 'Material', width: 140 },
    { title: 'Area', width: CONTENT_W - 400, align: 'right' },
  ], [
    ...shop.items.map((i) => [String(i.quantity), i.item, i.size, i.material + (i.mounting ? `; ${i.mounting}` : ''), `${i.areaM2.toFixed(2)} m²`]),
    [String(shop.totalCount), 'Total', '', '', `${shop.totalAreaM2.toFixed(2)} m²`],
  ], { boldLast: true })

  sub('Where the absorption figures come from')
  table(doc, [
    { title: 'Step', width: 34 },
    { title: '125', width: 34, align: 'right' },
    { title: '250', width: 34, align: 'right' },
    { title: '500', width: 34, align: 'right' },
    { title: '1k', width: 34, align: 'right' },
    { title: '2k', width: 34, align: 'right' },
    { title: '4k', width: 34, align: 'right' },
    { title: 'Source of the coefficients', width: CONTENT_W - 238 },
  ], [...pr.absorption].sort((x, y) => (stepOf.get(x.changeId) ?? 0) - (stepOf.get(y.changeId) ?? 0)).map((a) => [String(stepOf.get(a.changeId) ?? ''), ...[1, 2, 3, 4, 5, 6].map((k) => (a.alpha[k] === null ? '-' : a.alpha[k]!.toFixed(2))), a.source]))

  // ---------------------------------------------------------------- follow-up and cautions
  heading(FOLLOW_UP_MEASURING.title)
  FOLLOW_UP_MEASURING.steps.forEach((s, i) => para(`${i + 1}. ${s}`))
  heading('Before you build, hang or measure')
  for (const c of CAUTIONS) {
    ensureSpace(40)
    doc.font('Helvetica-Bold').fontSize(10).fillColor(COLORS.ink)
    text(c.title, { width: CONTENT_W, continued: false })
    para(c.text)
  }
  sub('How the order is chosen')
  para(pr.effectMeasure)

  // page footers
  const range = doc.bufferedPageRange()
  for (let i = 0; i < range.count; i++) {
    doc.switchToPage(range.start + i)
    const keep = doc.page.margins.bottom
    doc.page.margins.bottom = 0
    doc.font('Helvetica').fontSize(8).fillColor(COLORS.muted)
    doc.text(pdfText(`Roomwright · ${input.caseTitle} · plan version ${plan.version} · page ${i + 1} of ${range.count}`), MARGIN, A4.h - MARGIN + 8, { width: CONTENT_W, align: 'center', lineBreak: false })
    doc.page.margins.bottom = keep
  }
  doc.end()
  return done
}

// ==================================================================== tables

interface Column { title: string; width: number; align?: 'left' | 'right' }

function table(doc: Doc, cols: Column[], rows: string[][], opts: { boldLast?: boolean } = {}) {
  const pad = 3
  const size = 8.8
  const rowHeight = (cells: string[], font: string) => {
    doc.font(font).fontSize(size)
    return Math.max(...cells.map((c, i) => doc.heightOfString(pdfText(c), { width: cols[i].width - 2 * pad }))) + 2 * pad
  }
  const drawRow = (cells: string[], font: string, fill?: string) => {
    const h = rowHeight(cells, font)
    if (doc.y + h > A4.h - MARGIN - 14) {
      doc.addPage()
      drawRow(cols.map((c) => c.title), 'Helvetica-Bold', '#eef2f3')
    }
    const y = doc.y
    let x = MARGIN
    if (fill) doc.rect(MARGIN, y, cols.reduce((s, c) => s + c.width, 0), h).fill(fill)
    doc.fillColor(COLORS.ink).font(font).fontSize(size)
    cells.forEach((c, i) => {
      doc.text(pdfText(c), x + pad, y + pad, { width: cols[i].width - 2 * pad, align: cols[i].align ?? 'left' })
      x += cols[i].width
    })
    doc.moveTo(MARGIN, y + h).lineTo(x, y + h).lineWidth(0.4).strokeColor(COLORS.rule).stroke()
    doc.x = MARGIN
    doc.y = y + h
  }
  drawRow(cols.map((c) => c.title), 'Helvetica-Bold', '#eef2f3')
  rows.forEach((r, i) => drawRow(r, opts.boldLast && i === rows.length - 1 ? 'Helvetica-Bold' : 'Helvetica'))
  doc.moveDown(0.6)
}

// ==================================================================== drawings

interface Box { x: number; y: number; w: number; h: number }

function dimension(doc: Doc, x1: number, y1: number, x2: number, y2: number, label: string, side: 1 | -1 = -1) {
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

function badge(doc: Doc, x: number, y: number, n: number | string) {
  doc.circle(x, y, 6).fill(COLORS.after)
  doc.font('Helvetica-Bold').fontSize(7).fillColor('#ffffff')
  const s = String(n)
  doc.text(s, x - doc.widthOfString(s) / 2, y - 3.2, { lineBreak: false })
}

function drawPlanView(doc: Doc, input: PlanPdfInput, stepOf: Map<string, number>, box: Box) {
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

/** Wall elevations as seen from inside: u runs along the wall from the drawing's left end. */
function drawElevations(doc: Doc, input: PlanPdfInput, stepOf: Map<string, number>, box: Box): number {
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

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1)

// ==================================================================== charts

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

function drawRtChart(doc: Doc, pr: PlanVersion['predictions'], outer: Box) {
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

function drawLfChart(doc: Doc, pr: PlanVersion['predictions'], outer: Box) {
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
