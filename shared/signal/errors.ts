/** Machine codes for a measurement file Roomwright refuses to analyse. */
export type MeasurementErrorCode =
  | 'empty-file'
  | 'not-wav'
  | 'truncated'
  | 'no-samples'
  | 'unsupported-encoding'
  | 'unsupported-sample-rate'
  | 'unsupported-channels'
  | 'too-long'
  | 'too-short'
  | 'silent'
  | 'non-finite-samples'
  | 'unknown-kind'
  | 'text-not-utf8'
  | 'text-no-header'
  | 'text-missing-column'
  | 'text-unparseable-row'
  | 'text-descending-frequency'
  | 'text-duplicate-frequency'
  | 'text-frequency-out-of-range'
  | 'text-too-few-points'

/**
 * A measurement file that cannot be analysed, with a machine code for the client
 * and a message that names the physical or format reason.
 */
export class MeasurementFileError extends Error {
  readonly code: MeasurementErrorCode
  /** 1-based line number in a text file, where the error is tied to one row. */
  readonly row?: number

  constructor(code: MeasurementErrorCode, message: string, opts: { row?: number } = {}) {
    super(message)
    this.name = 'MeasurementFileError'
    this.code = code
    if (opts.row !== undefined) this.row = opts.row
  }

  toJSON(): { code: MeasurementErrorCode; message: string; row?: number } {
    return this.row === undefined ? { code: this.code, message: this.message } : { code: this.code, message: this.message, row: this.row }
  }
}

/** Something worth telling the advisor that does not stop the analysis. */
export interface MeasurementWarning {
  code: 'clipping' | 'low-dynamic-range'
  message: string
}
