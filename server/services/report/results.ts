import { shoppingList, surfaceWords } from '../../../shared/plan'
import { drawLfChart, drawRtChart } from './charts'
import { CONTENT_W, MARGIN, f2, rightColumns } from './pdf-doc'
import { unpack, type Section } from './sections'

/** The report's predictions: the before/after charts, the reflection table, flags, the shopping list and the absorption sources. */
export function predictionPages(ctx: Section) {
  const { doc, heading, sub, para, ensureSpace, table, stepOf, plan, room, pr } = unpack(ctx)
  doc.addPage()
  heading('Before and after (predicted)')
  sub('Reverberation time per octave band')
  para(`Eyring reverberation time from the surfaces, furnishings, air and the plan's treatments, today (grey) and after the plan (teal); the shaded band is the target: ${pr.rtTarget.description}.`, { lineGap: 1 })
  drawRtChart(doc, pr, { x: MARGIN, y: doc.y + 4, w: CONTENT_W, h: 190 })
  doc.y += 206
  table([
    { title: 'Band', width: 60 },
    ...rightColumns(['Sabine today', 'Sabine after', 'Eyring today', 'Eyring after'], 80),
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
  table([
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


  // shopping list and sources
  heading('Shopping list')
  const shop = shoppingList(plan.body.treatments)
  table([
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
  table([
    { title: 'Step', width: 34 },
    ...rightColumns(['125', '250', '500', '1k', '2k', '4k'], 34),
    { title: 'Source of the coefficients', width: CONTENT_W - 238 },
  ], [...pr.absorption].sort((x, y) => (stepOf.get(x.changeId) ?? 0) - (stepOf.get(y.changeId) ?? 0)).map((a) => [String(stepOf.get(a.changeId) ?? ''), ...[1, 2, 3, 4, 5, 6].map((k) => (a.alpha[k] === null ? '-' : a.alpha[k]!.toFixed(2))), a.source]))
}
