import bcrypt from 'bcryptjs'
import { randomBytes } from 'node:crypto'
import { findUserByEmail, findUserById, insertUser, toPublicUser, updateUser } from '../data/users'
import { AppError, conflict } from '../errors'
import { assertStrongPassword } from '../auth/password-strength'
import type { Preferences, RegisterInput, User } from '../../shared/schemas/auth'

/** bcrypt cost factor: 12 rounds in production (OWASP Password Storage Cheat Sheet: at least 10). */
export const bcryptRounds = () => (process.env.NODE_ENV === 'production' ? 12 : 10)

export const hashPassword = (password: string) => bcrypt.hash(password, bcryptRounds())

// A hash of a random string, compared against when the e-mail is unknown (or the account has no password yet)
// so both paths cost one bcrypt comparison at the SAME cost factor as real hashes: a decoy made with a
// cheaper factor answered unknown e-mails about 3.6 times faster in production and told who has an account.
// Made on first use with the cost factor in force, without blocking the event loop.
const decoys = new Map<number, Promise<string>>()
export function decoyHash(rounds = bcryptRounds()): Promise<string> {
  let d = decoys.get(rounds)
  if (!d) {
    d = bcrypt.hash(randomBytes(24).toString('base64url'), rounds)
    decoys.set(rounds, d)
  }
  return d
}

/** Checks an e-mail and password; null when either is wrong or the account is switched off. Same cost on every path. */
export async function verifyCredentials(email: string, password: string): Promise<User | null> {
  const user = await findUserByEmail(email)
  const ok = await bcrypt.compare(password, user?.passwordHash ?? (await decoyHash()))
  if (!user || !ok || !user.active || !user.passwordHash) return null
  return toPublicUser(user)
}

export async function registerListener(input: RegisterInput): Promise<User> {
  assertStrongPassword(input.password, [input.email, input.name])
  // hashed before the lookup, so a taken address answers no faster than a free one (the timing would tell who has an account)
  const passwordHash = await hashPassword(input.password)
  if (await findUserByEmail(input.email)) throw conflict('An account with that e-mail already exists', 'email_taken')
  return toPublicUser(await insertUser({ email: input.email, name: input.name, role: 'listener', passwordHash }))
}


/** The user a session points at, or null when it is gone or switched off (the session then ends). */
export async function sessionUser(id: string): Promise<User | null> {
  const user = await findUserById(id)
  if (!user || !user.active) return null
  return toPublicUser(user)
}

export function assertRole(user: User | undefined, roles: User['role'][]): asserts user is User {
  if (!user) throw new AppError('Please sign in first', { status: 401, code: 'signed_out' })
  if (!roles.includes(user.role)) throw new AppError('Your role may not do that', { status: 403, code: 'forbidden' })
}

export async function getPreferences(userId: string): Promise<Preferences> {
  const u = await findUserById(userId)
  if (!u) throw new AppError('Please sign in first', { status: 401, code: 'signed_out' })
  return { units: u.units, emailOptional: u.emailOptional }
}

export async function setPreferences(userId: string, patch: Partial<Preferences>): Promise<Preferences> {
  const u = await updateUser(userId, patch)
  if (!u) throw new AppError('Please sign in first', { status: 401, code: 'signed_out' })
  return { units: u.units, emailOptional: u.emailOptional }
}
