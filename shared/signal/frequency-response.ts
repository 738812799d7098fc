/**
 * Roomwright's plain-text frequency-response format (see FORMAT.md): parsing and
 * validation.
 */
import { MeasurementFileError } from './errors'

export const FR_MIN_HZ = 20
export const FR_MAX_HZ = 20000
export const FR_MIN_POINTS = 10

export interface FrequencyResponsePoints {
  freqsHz: number[]
  splDb: number[]
  /** present only when the file has a phase_deg column */
  phaseDeg?: number[]
}

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/

/**
 * Parses a frequency-response text file: CSV or whitespace-separated columns under
 * a header naming `frequency_hz`, `spl_db` and optionally `phase_deg`; `#` comments.
 * @throws MeasurementFileError naming the line for a bad row, a descending or repeated
 *   frequency, or a frequency outside 20–20 000 Hz
 */
export function parseFrequencyResponse(text: string): FrequencyResponsePoints {
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/)
  let header: { sep: RegExp; freq: number; spl: number; phase: number; columns: number; row: number } | null = null
  const freqsHz: number[] = []
  const splDb: number[] = []
  const phaseDeg: number[] = []
  for (let li = 0; li < lines.length; li++) {
    const row = li + 1
    const line = lines[li].trim()
    if (line === '' || line.startsWith('#')) continue
    if (!header) {
      const sep = line.includes(',') ? /\s*,\s*/ : /\s+/
      const names = line.split(sep).map((n) => n.trim().toLowerCase())
      const freq = names.indexOf('frequency_hz')
      const spl = names.indexOf('spl_db')
      if (freq < 0 && spl < 0) {
        throw new MeasurementFileError('text-no-header', `line ${row}: expected a header line naming the columns frequency_hz and spl_db (optional phase_deg), found "${line.slice(0, 60)}"`, { row })
      }
      if (freq < 0 || spl < 0) {
        throw new MeasurementFileError('text-missing-column', `line ${row}: the header lacks the ${freq < 0 ? 'frequency_hz' : 'spl_db'} column`, { row })
      }
      header = { sep, freq, spl, phase: names.indexOf('phase_deg'), columns: names.length, row }
      continue
    }
    const fields = line.split(header.sep)
    if (fields.length !== header.columns) {
      throw new MeasurementFileError('text-unparseable-row', `line ${row}: expected ${header.columns} values, found ${fields.length}: "${line.slice(0, 60)}"`, { row })
    }
    const read = (col: number, name: string): number => {
      const v = fields[col].trim()
      if (!NUMBER.test(v)) throw new MeasurementFileError('text-unparseable-row', `line ${row}: ${name} "${v.slice(0, 30)}" is not a number`, { row })
      return Number(v)
    }
    const f = read(header.freq, 'frequency_hz')
    const spl = read(header.spl, 'spl_db')
    const phase = header.phase >= 0 ? read(header.phase, 'phase_deg') : 0
    if (!Number.isFinite(f) || !Number.isFinite(spl) || !Number.isFinite(phase)) {
      throw new MeasurementFileError('text-unparseable-row', `line ${row}: value out of the numeric range`, { row })
    }
    if (f < FR_MIN_HZ || f > FR_MAX_HZ) {
      throw new MeasurementFileError('text-frequency-out-of-range', `line ${row}: frequency ${f} Hz lies outside ${FR_MIN_HZ}–${FR_MAX_HZ} Hz`, { row })
    }
    const prev = freqsHz[freqsHz.length - 1]
    if (prev !== undefined && f === prev) {
      throw new MeasurementFileError('text-duplicate-frequency', `line ${row}: frequency ${f} Hz appears twice; each frequency once, ascending`, { row })
    }
    if (prev !== undefined && f < prev) {
      throw new MeasurementFileError('text-descending-frequency', `line ${row}: frequency ${f} Hz comes after ${prev} Hz; frequencies must ascend`, { row })
    }
    freqsHz.push(f)
    splDb.push(spl)
    if (header.phase >= 0) phaseDeg.push(phase)
  }
  if (!header) throw new MeasurementFileError('text-no-header', 'the file holds no header line naming frequency_hz and spl_db (only comments or blank lines)')
  if (freqsHz.length < FR_MIN_POINTS) {
    throw new MeasurementFileError('text-too-few-points', `the file holds ${freqsHz.length} data rows; at least ${FR_MIN_POINTS} are needed`)
  }
  return header.phase >= 0 ? { freqsHz, splDb, phaseDeg } : { freqsHz, splDb }
}

/** Decodes bytes as UTF-8 text (refusing invalid UTF-8) and parses them. */
export function parseFrequencyResponseBytes(bytes: Uint8Array): FrequencyResponsePoints {
  if (bytes.length === 0) throw new MeasurementFileError('empty-file', 'the file is empty (0 bytes)')
  let text: string
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes)
  } catch {
    throw new MeasurementFileError('text-not-utf8', 'the file is not UTF-8 text; a frequency response must be a plain-text table')
  }
  if (text.includes('\u0000')) throw new MeasurementFileError('text-not-utf8', 'the file holds binary data, not a plain-text table')
  return parseFrequencyResponse(text)
}
