import type { RequestHandler } from 'express'
import { AppError } from '../errors'
import type { Role, User } from '../../shared/schemas/auth'

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport puts the signed-in user here
    interface User {
      id: string
      email: string
      name: string
      role: Role
    }
  }
}

export const signedOut = () => new AppError('Please sign in first', { status: 401, code: 'signed_out' })

export const requireSignedIn: RequestHandler = (req, _res, next) => {
  if (!req.user) return next(signedOut())
  next()
}

/** Route policy: only these roles may call the route (401 when signed out, 403 for other roles). */
export function requireRole(...roles: Role[]): RequestHandler {
  return (req, _res, next) => {
    if (!req.user) return next(signedOut())
    if (!roles.includes(req.user.role)) return next(new AppError('Your role may not do that', { status: 403, code: 'forbidden' }))
    next()
  }
}

export function currentUser(req: { user?: Express.User }): User {
  if (!req.user) throw signedOut()
  return req.user
}
