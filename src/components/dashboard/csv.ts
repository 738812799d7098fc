export interface Column<Row> { key: string; title: string; value: (row: Row) => string | number | null | undefined }

/** RFC 4180 CSV: fields with a comma, quote or line break are quoted, quotes doubled; lines end in CRLF. */
export function toCsv<Row>(columns: Column<Row>[], rows: Row[]): string {
  const field = (v: string | number | null | undefined) => {
    const s = v === null || v === undefined ? '' : String(v)
    return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s
  }
  return [columns.map((c) => field(c.title)), ...rows.map((r) => columns.map((c) => field(c.value(r))))].map((l) => l.join(',')).join('\r\n') + '\r\n'
}

/** Saves the text as a file from the browser (no server round trip). */
export function downloadCsv(filename: string, csv: string): void {
  const url = URL.createObjectURL(new Blob(['\ufeff', csv], { type: 'text/csv;charset=utf-8' }))
  const a = document.createElement('a')
  a.href = url
  a.download = filename
  document.body.appendChild(a)
  a.click()
  a.remove()
  setTimeout(() => URL.revokeObjectURL(url), 1000)
}
