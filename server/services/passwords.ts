import { assertStrongPassword } from '../auth/password-strength'
import bcrypt from 'bcryptjs'
import { randomBytes } from 'node:crypto'
import { withTransaction } from '../db/transaction'
import { findUserByEmail, findUserForUpdate, updateUser } from '../data/users'
import { countResetTokensSince, findResetTokenForUse, insertResetToken, spendResetTokens } from '../data/password-resets'
import { AppError } from '../errors'
import { log } from '../lib/log'
import { queueEmail } from '../mail/outbox'
import { publicBaseUrl } from '../mail/templates'
import { hashPassword } from './auth'
import { endSessions, hashToken, recordAudit } from './team'
import type { ChangePasswordInput, PasswordResetInput, Role, User } from '../../shared/schemas/auth'

/** How long a reset link works (OWASP Forgot Password Cheat Sheet: short-lived). */
export const RESET_LINK_MINUTES = 60
/** At most this many reset e-mails per account per hour, whoever asks; further requests get the same answer and no e-mail. */
export const RESET_EMAILS_PER_HOUR = 3

/** The one answer to "forgot password", whether or not the address has an account. */
export const RESET_REQUESTED_MESSAGE =
  'If that address belongs to a Roomwright account, a link to choose a new password is on its way. It works once, for 60 minutes. Check the spam folder if nothing arrives.'

/**
 * The token travels in the fragment (#), which browsers never send to a server nor put in a Referer.
 * The link also says whose account it is (`for=staff` or `for=listener`), so the page speaks to them (a display hint only:
 * the server judges the token alone).
 */
export const resetPasswordUrl = (token: string, role?: Role) =>
  `${publicBaseUrl()}/reset-password#token=${token}${role ? `&for=${role === 'listener' ? 'listener' : 'staff'}` : ''}`

const wrongCurrent = () =>
  new AppError('Your current password is not right', { status: 400, code: 'bad_current_password', fields: [{ path: 'currentPassword', message: 'that is not your current password' }] })
const linkGone = () =>
  new AppError('This link no longer works: it was used already, replaced by a newer one, or it has expired. Ask for a new link from the sign-in page.', { status: 410, code: 'link_gone' })

/**
 * Changes the signed-in user's password after checking the current one. Every other session of the
 * account ends (rows and their sockets); the session making the change stays signed in. Audited,
 * and the account's address is told.
 */
export async function changePassword(user: User, sessionId: string, input: ChangePasswordInput): Promise<{ sessionsEnded: number }> {
  assertStrongPassword(input.newPassword, [user.email, user.name], 'newPassword')
  const newHash = await hashPassword(input.newPassword)
  return withTransaction(async (t, afterCommit) => {
    const u = await findUserForUpdate(user.id, t)
    if (!u || !u.active) throw new AppError('Please sign in first', { status: 401, code: 'signed_out' })
    if (!u.passwordHash || !(await bcrypt.compare(input.currentPassword, u.passwordHash))) throw wrongCurrent()
    await updateUser(u.id, { passwordHash: newHash }, t)
    await spendResetTokens(u.id, t)
    const sessionsEnded = await endSessions(u.id, t, afterCommit, sessionId)
    await recordAudit({ actorId: u.id, action: 'password.changed', targetUserId: u.id, targetName: u.name, targetEmail: u.email, details: { sessionsEnded } }, t)
    await queueEmail({ to: u.email, toUserId: u.id, kind: 'password-changed', vars: { changedAt: new Date(), how: 'signed-in' } }, { transaction: t })
    return { sessionsEnded }
  })
}

/**
 * The work behind "forgot password": for an active account under its hourly limit, a new one-time
 * link (older open links are spent) by e-mail through the outbox. Unknown, switched-off and
 * over-limit addresses get nothing. Callers answer before this runs (see startPasswordReset).
 */
export async function sendPasswordResetLink(email: string): Promise<'sent' | 'no_account' | 'limited'> {
  const u = await findUserByEmail(email)
  if (!u || !u.active) return 'no_account'
  const token = randomBytes(32).toString('base64url')
  return withTransaction(async (t) => {
    const locked = await findUserForUpdate(u.id, t) // serialises concurrent requests for one account, so the limit holds
    if (!locked?.active) return 'no_account'
    if ((await countResetTokensSince(u.id, new Date(Date.now() - 3600_000), t)) >= RESET_EMAILS_PER_HOUR) return 'limited'
    await spendResetTokens(u.id, t)
    const row = await insertResetToken({ userId: u.id, tokenHash: hashToken(token), expiresAt: new Date(Date.now() + RESET_LINK_MINUTES * 60_000) }, t)
    await queueEmail({ to: u.email, toUserId: u.id, kind: 'password-reset', vars: { resetUrl: resetPasswordUrl(token, u.role), expiresAt: row.expiresAt } }, { transaction: t })
    return 'sent'
  })
}

const pending = new Set<Promise<unknown>>()
/**
 * Starts the reset work without waiting for it, so the HTTP answer (status, body and timing) is the
 * same for every address; failures are logged, never shown.
 */
export function startPasswordReset(email: string): void {
  const p = sendPasswordResetLink(email)
    .catch((e) => log.warn('password reset request failed', { err: String(e) }))
    .finally(() => pending.delete(p))
  pending.add(p)
}
/** Resolves when every reset request started so far has finished (tests, shutdown). */
export const passwordResetsSettled = () => Promise.allSettled([...pending]).then(() => undefined)

/**
 * Uses a reset link once: the new password is set, every open link of the account is spent, and
 * every session of the account ends (the person signs in afresh). A used, replaced, expired or
 * unknown link — or a switched-off account — answers 410.
 */
export async function resetPassword(input: PasswordResetInput): Promise<void> {
  assertStrongPassword(input.password)
  const newHash = await hashPassword(input.password)
  await withTransaction(async (t, afterCommit) => {
    const link = await findResetTokenForUse(hashToken(input.token), t)
    if (!link || link.spentAt || link.expiresAt.getTime() <= Date.now()) throw linkGone()
    const u = await findUserForUpdate(link.userId, t)
    if (!u || !u.active) throw linkGone()
    await updateUser(u.id, { passwordHash: newHash }, t)
    await spendResetTokens(u.id, t)
    const sessionsEnded = await endSessions(u.id, t, afterCommit)
    await recordAudit({ actorId: u.id, action: 'password.reset', targetUserId: u.id, targetName: u.name, targetEmail: u.email, details: { sessionsEnded } }, t)
    await queueEmail({ to: u.email, toUserId: u.id, kind: 'password-changed', vars: { changedAt: new Date(), how: 'reset-link' } }, { transaction: t })
  })
}
