import type PDFDocument from 'pdfkit'
import type { PlanRoom } from '../../../shared/plan'
import type { PlanVersion } from '../../../shared/schemas/plan'

/** The plan report's page, type and table basics (report-pdf.ts puts the sections together). */

export interface PlanPdfInput {
  plan: PlanVersion
  room: PlanRoom & { name?: string }
  caseTitle: string
  listenerName: string
}

export type Doc = InstanceType<typeof PDFDocument>
export interface Box { x: number; y: number; w: number; h: number }

export const A4 = { w: 595.28, h: 841.89 }
export const MARGIN = 48
export const CONTENT_W = A4.w - 2 * MARGIN
export const COLORS = {
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

export const f2 = (v: number) => v.toFixed(2)
export const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1)

/** Headings, paragraphs and tables that flow down the pages, a new page when one is full. */
export function writer(doc: Doc) {
  const text = (s: string, opts: PDFKit.Mixins.TextOptions = {}) => doc.text(pdfText(s), opts)
  const bottom = () => A4.h - MARGIN - 14
  function ensureSpace(h: number) {
    if (doc.y + h > bottom()) doc.addPage()
  }
  /** a bold line of `size` pt, after `before` lines of space and with `space` free below it */
  const title = (s: string, size: number, before: number, after: number, space: number) => {
    ensureSpace(space)
    doc.moveDown(before).font('Helvetica-Bold').fontSize(size).fillColor(COLORS.ink)
    text(s, { width: CONTENT_W })
    doc.moveDown(after).font('Helvetica').fontSize(10)
  }
  const heading = (s: string) => title(s, 14, 0.6, 0.3, 60)
  const sub = (s: string) => title(s, 11, 0.4, 0.15, 40)
  const para = (s: string, opts: PDFKit.Mixins.TextOptions = {}) => {
    doc.font('Helvetica').fontSize(10).fillColor(COLORS.ink)
    text(s, { width: CONTENT_W, lineGap: 1.5, ...opts })
    doc.moveDown(0.35)
  }
  return { doc, text, heading, sub, para, bottom, ensureSpace, table: (cols: Column[], rows: string[][], opts: { boldLast?: boolean } = {}) => table(doc, cols, rows, opts) }
}
export type Writer = ReturnType<typeof writer>

// ==================================================================== tables

export interface Column { title: string; width: number; align?: 'left' | 'right' }

/** Figure columns of one width, right-aligned. */
export const rightColumns = (titles: string[], width: number): Column[] => titles.map((title) => ({ title, width, align: 'right' }))

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

/** Every page's footer line, once all pages are laid out (the page count is known then). */
export function footers(doc: Doc, line: (page: number, count: number) => string) {
  const range = doc.bufferedPageRange()
  for (let i = 0; i < range.count; i++) {
    doc.switchToPage(range.start + i)
    const keep = doc.page.margins.bottom
    doc.page.margins.bottom = 0
    doc.font('Helvetica').fontSize(8).fillColor(COLORS.muted)
    doc.text(pdfText(line(i + 1, range.count)), MARGIN, A4.h - MARGIN + 8, { width: CONTENT_W, align: 'center', lineBreak: false })
    doc.page.margins.bottom = keep
  }
}
