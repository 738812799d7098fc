export interface FieldError { path: string; message: string }

/** The one error type routes and services throw; the error middleware turns it into JSON. */
export class AppError extends Error {
  readonly status: number
  readonly code: string
  readonly fields?: FieldError[]
  constructor(message: string, opts: { status: number; code: string; fields?: FieldError[] }) {
    super(message)
    this.status = opts.status
    this.code = opts.code
    this.fields = opts.fields
  }
}

export const notFound = (what = 'That page') => new AppError(`${what} was not found`, { status: 404, code: 'not_found' })
export const forbidden = (message = 'You may not do that') => new AppError(message, { status: 403, code: 'forbidden' })
export const conflict = (message: string, code = 'conflict') => new AppError(message, { status: 409, code })
export const badRequest = (message: string, fields?: FieldError[]) =>
  new AppError(message, { status: 400, code: 'invalid', fields })
