import { CAUTIONS, FOLLOW_UP_MEASURING, placement, treatmentTypeNames } from '../../../shared/plan'
import { formatDate } from '../../../shared/words/dates'
import { drawElevations } from './elevations'
import { A4, COLORS, CONTENT_W, MARGIN, f2, pdfText, plainMarkdown, type PlanPdfInput, type Writer } from './pdf-doc'
import { drawPlanView } from './plan-view'

/** What every section reads: the page writer, the plan and room, and each change's step number. */
export interface Section {
  w: Writer
  input: PlanPdfInput
  stepOf: Map<string, number>
}

/** A section's tools and data in one: the writer's helpers, the input, the plan, its room and its predictions. */
export const unpack = (ctx: Section) => ({ ...ctx.w, ...ctx, plan: ctx.input.plan, room: ctx.input.room, pr: ctx.input.plan.predictions })

/** Page 1: the case, the figures at the main seat today and after, the steps in order and the advisor's notes. */
export function summaryPage(ctx: Section) {
  const { doc, text, heading, sub, para, ensureSpace, table, input, plan, room, pr } = unpack(ctx)
  const changeOf = new Map(pr.changes.map((c) => [c.id, c]))
  const sentWords = plan.sentAt
    ? `sent ${formatDate(plan.sentAt, { timeZone: 'UTC' })}${plan.sentBy ? ` by ${plan.sentBy.name}` : ''}`
    : 'draft, not yet sent'

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
  table([
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
}

/** The drawings: the plan view, the four walls, where each item goes and the new seat and speaker positions. */
export function drawingPages(ctx: Section) {
  const { doc, heading, sub, para, bottom, table, input, stepOf, plan, room } = unpack(ctx)
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
  table([
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
    table([{ title: 'Step', width: 34 }, { title: 'What', width: 90 }, { title: 'New position', width: CONTENT_W - 124 }], moves)
  }
}

/** The last section: measuring again, the safety cautions and how the order was chosen. */
export function closingPages(ctx: Section) {
  const { doc, text, heading, sub, para, ensureSpace, pr } = unpack(ctx)
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
}
