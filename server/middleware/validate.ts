import type { RequestHandler } from 'express'
import type { ZodType } from 'zod'
import { AppError } from '../errors'

export function zodFields(issues: { path: PropertyKey[]; message: string }[]) {
  return issues.map((i) => ({ path: i.path.map(String).join('.'), message: i.message }))
}

/** Validates one part of the request with a shared zod schema and keeps the result in res.locals[part]. */
export function validate(schema: ZodType, part: 'body' | 'query' | 'params' = 'body'): RequestHandler {
  return (req, res, next) => {
    const parsed = schema.safeParse(req[part] ?? {})
    if (!parsed.success) {
      return next(new AppError('Some fields need another look', { status: 400, code: 'invalid', fields: zodFields(parsed.error.issues) }))
    }
    res.locals[part] = parsed.data
    next()
  }
}
