import passport from 'passport'
import { Strategy as LocalStrategy } from 'passport-local'
import type { Request } from 'express'
import { decoyHash, sessionUser, verifyCredentials } from '../services/auth'
import { userReadWithSession } from './session-store'

let configured = false
export function configurePassport(): typeof passport {
  if (configured) return passport
  // Made now, so the first unknown e-mail does not pay for making it (that would stand out in the timing).
  void decoyHash()
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      verifyCredentials(email, password).then((u) => done(null, u ?? false), done)
    }),
  )
  passport.serializeUser((user, done) => done(null, user.id))
  // The session store reads the user in the same statement as the session (auth/session-store.ts);
  // a session made during this request (sign-in) has none attached and is looked up here.
  passport.deserializeUser((req: Request, id: string, done: (err: unknown, user?: Express.User | false) => void) => {
    const read = userReadWithSession((req.session as { passport?: unknown } | undefined)?.passport)
    if (read !== undefined && read?.id === id) return done(null, read)
    if (read === null) return done(null, false)
    sessionUser(id).then((u) => done(null, u ?? false), done)
  })
  configured = true
  return passport
}
