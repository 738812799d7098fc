import { inflateSync } from 'node:zlib'

/** WinAnsi codes 0x80–0x9f that differ from Latin-1 (PDF 32000-1, Annex D). */
const WIN_ANSI: Record<number, string> = {
  0x80: '€', 0x82: '‚', 0x83: 'ƒ', 0x84: '„', 0x85: '…', 0x86: '†', 0x87: '‡', 0x88: 'ˆ', 0x89: '‰', 0x8a: 'Š', 0x8b: '‹', 0x8c: 'Œ',
  0x8e: 'Ž', 0x91: '‘', 0x92: '’', 0x93: '“', 0x94: '”', 0x95: '•', 0x96: '–', 0x97: '—', 0x98: '˜', 0x99: '™', 0x9a: 'š', 0x9b: '›',
  0x9c: 'œ', 0x9e: 'ž', 0x9f: 'Ÿ',
}

/** The decoded content of every stream in a PDF (FlateDecode inflated, others as they are). */
export function pdfStreams(pdf: Buffer): string[] {
  const out: string[] = []
  const raw = pdf.toString('latin1')
  const re = /<<([^]*?)>>\s*stream\r?\n/g
  let m: RegExpExecArray | null
  while ((m = re.exec(raw))) {
    const start = m.index + m[0].length
    const end = raw.indexOf('endstream', start)
    const bytes = pdf.subarray(start, end)
    if (/\/FlateDecode/.test(m[1])) {
      try { out.push(inflateSync(bytes).toString('latin1')) } catch { /* not a content stream we can read */ }
    } else out.push(bytes.toString('latin1'))
  }
  return out
}

/**
 * A tiny text extraction for PDFs written with standard fonts: the hex strings of every TJ / Tj,
 * WinAnsi-decoded; the pieces of one text object joined without gaps, text objects by newlines.
 */
export function pdfText(pdf: Buffer): string {
  const lines: string[] = []
  for (const s of pdfStreams(pdf)) {
    for (const block of s.split(/\bET\b/)) {
      const pieces = [...block.matchAll(/<([0-9a-fA-F]*)>/g)].map((h) => {
        let t = ''
        for (let i = 0; i + 1 < h[1].length; i += 2) {
          const c = parseInt(h[1].slice(i, i + 2), 16)
          t += WIN_ANSI[c] ?? String.fromCharCode(c)
        }
        return t
      })
      if (pieces.length) lines.push(pieces.join(''))
    }
  }
  return lines.join('\n')
}

/** Pages of the document (page objects, not the page tree). */
export function pdfPageCount(pdf: Buffer): number {
  return (pdf.toString('latin1').match(/\/Type\s*\/Page\b(?!s)/g) ?? []).length
}

/** Counts of path operators in the content streams: rectangles, line segments, curves, strokes, fills. */
export function pdfPathOps(pdf: Buffer): { re: number; l: number; c: number; S: number; f: number } {
  const all = pdfStreams(pdf).join('\n')
  const count = (re: RegExp) => (all.match(re) ?? []).length
  return { re: count(/\sre\b/g), l: count(/\sl\b/g), c: count(/\sc\b/g), S: count(/\sS\b/g), f: count(/\s(f|B)\b/g) }
}
