import passport from 'passport'
import { Strategy as LocalStrategy } from 'passport-local'
import { decoyHash, sessionUser, verifyCredentials } from '../services/auth'

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
  passport.deserializeUser((id: string, done) => {
    sessionUser(id).then((u) => done(null, u ?? false), done)
  })
  configured = true
  return passport
}
