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

/** The path of the first string holding a NUL character, which PostgreSQL text and jsonb cannot store. */
function nulPath(value: unknown, path: string[] = [], depth = 0): string | null {
  if (depth > 64) return null
  if (typeof value === 'string') return value.includes('\u0000') ? path.join('.') || '(body)' : null
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const p = nulPath(value[i], [...path, String(i)], depth + 1)
      if (p) return p
    }
  } else if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      if (k.includes('\u0000')) return [...path, k.replace(/\u0000/g, '\\0')].join('.')
      const p = nulPath(v, [...path, k], depth + 1)
      if (p) return p
    }
  }
  return null
}

/** Refuses JSON bodies with NUL characters in any string (400 with the field path) before any route sees them. */
export const rejectNulCharacters: RequestHandler = (req, _res, next) => {
  const path = req.body === undefined ? null : nulPath(req.body)
  if (path) return next(new AppError('Text may not contain NUL characters', { status: 400, code: 'invalid', fields: [{ path, message: 'contains a NUL character' }] }))
  next()
}
