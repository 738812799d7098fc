import PDFDocument from 'pdfkit'
import { MARGIN, footers, pdfText, writer, type PlanPdfInput } from './report/pdf-doc'
import { predictionPages } from './report/results'
import { closingPages, drawingPages, summaryPage } from './report/sections'

/**
 * The plan as a PDF the listener can keep: A4, pdfkit's standard Helvetica (text stays searchable),
 * drawings and charts as vector paths. Sections: summary and steps, room drawings (plan view and
 * the four walls, every treatment dimensioned from the walls and corners), before/after charts and
 * the reflection table, the shopping list, absorption sources, follow-up measuring, cautions.
 * The parts live in ./report: the page basics (pdf-doc), the sections, the drawings and the charts.
 */

export type { PlanPdfInput } from './report/pdf-doc'
export { pdfText, plainMarkdown } from './report/pdf-doc'

export async function renderPlanPdf(input: PlanPdfInput): Promise<Buffer> {
  const { plan } = input
  const doc = new PDFDocument({
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

  const ctx = { w: writer(doc), input, stepOf: new Map(plan.predictions.order.map((id, i) => [id, i + 1])) }
  summaryPage(ctx)
  drawingPages(ctx)
  predictionPages(ctx)
  closingPages(ctx)
  footers(doc, (page, count) => `Roomwright · ${input.caseTitle} · plan version ${plan.version} · page ${page} of ${count}`)
  doc.end()
  return done
}
