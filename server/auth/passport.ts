import passport from 'passport'
import { Strategy as LocalStrategy } from 'passport-local'
import { sessionUser, verifyCredentials } from '../services/auth'

let configured = false
export function configurePassport(): typeof passport {
  if (configured) return passport
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
