import type { ErrorRequestHandler, RequestHandler } from 'express'
import { MulterError } from 'multer'
import { AppError } from '../errors'
import { log } from '../lib/log'

export const notFoundHandler: RequestHandler = (req, _res, next) => {
  next(new AppError(`No such API route: ${req.method} ${req.path}`, { status: 404, code: 'not_found' }))
}

/**
 * The database is unreachable or went away mid-request: refused or reset connections, SQLSTATE
 * class 08 (connection exception) and 57P01–57P03 (shutdown / cannot connect now), and node-postgres'
 * own "Connection terminated" errors, whether thrown directly or wrapped by Sequelize (parent/original/cause).
 */
export const isDatabaseUnavailable = (err: unknown, depth = 0): boolean => {
  if (!err || typeof err !== 'object' || depth > 4) return false
  const e = err as { name?: string; code?: string; message?: string; parent?: unknown; original?: unknown; cause?: unknown }
  const name = e.name ?? ''
  const code = String(e.code ?? '')
  if (/Sequelize(Connection|ConnectionRefused|ConnectionAcquireTimeout|HostNotReachable|ConnectionTimedOut)Error/.test(name)) return true
  if (['ECONNREFUSED', 'ECONNRESET', 'EPIPE', '57P01', '57P02', '57P03'].includes(code) || /^08/.test(code)) return true
  if (/Connection terminated|not queryable|terminating connection/i.test(e.message ?? '')) return true
  return isDatabaseUnavailable(e.parent, depth + 1) || isDatabaseUnavailable(e.original, depth + 1) || isDatabaseUnavailable(e.cause, depth + 1)
}

/** The one error middleware: JSON `{ error: { code, message, fields? } }`, never a stack trace. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  let status = 500
  let body: { code: string; message: string; fields?: { path: string; message: string }[] } = { code: 'internal', message: 'Something went wrong on our side; please try again' }
  if (err instanceof AppError) {
    status = err.status
    body = { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) }
  } else if (err instanceof MulterError) {
    status = err.code === 'LIMIT_FILE_SIZE' ? 413 : 400
    body = { code: err.code === 'LIMIT_FILE_SIZE' ? 'too_large' : 'bad_upload', message: err.code === 'LIMIT_FILE_SIZE' ? 'That file is too large' : err.message }
  } else if ((err as { type?: string })?.type === 'entity.too.large') {
    status = 413
    body = { code: 'too_large', message: 'That request is too large' }
  } else if ((err as { type?: string })?.type === 'entity.parse.failed') {
    status = 400
    body = { code: 'invalid_json', message: 'The request body is not valid JSON' }
  } else if ((err as { type?: string })?.type === 'encoding.unsupported') {
    status = 415
    body = { code: 'unsupported_encoding', message: 'The request body uses a Content-Encoding this server does not read (use gzip, deflate or none)' }
  } else if ((err as { expose?: boolean })?.expose === true && (err as { status?: number }).status === 400) {
    // body-parser's own 400s (e.g. a body that claims gzip but is not) carry no `type`
    status = 400
    body = { code: 'unreadable_body', message: 'The request body could not be read' }
  } else if (isDatabaseUnavailable(err)) {
    status = 503
    body = { code: 'unavailable', message: 'The database is not answering; please try again in a moment' }
    res.set('Retry-After', '5')
  }
  if (status >= 500) log.error('request failed', { method: req.method, path: req.path, status, err: String((err as Error)?.stack ?? err) })
  if (res.headersSent) return
  res.status(status).json({ error: body })
}
