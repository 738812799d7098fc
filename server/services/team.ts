import { assertStrongPassword } from '../auth/password-strength'
import { createHash, randomBytes } from 'node:crypto'
import { Op, col, fn, where, type Transaction, type WhereOptions } from 'sequelize'
import { models, type AuditLogModel, type TeamInvitationModel, type UserModel } from '../db/models'
import { dbNow, dbNowPlus, dbPassed } from '../db/models/now'
import { withTransaction } from '../db/transaction'
import { insertEvent } from '../data/events'
import { AppError, conflict, forbidden, notFound } from '../errors'
import { queueEmail } from '../mail/outbox'
import { publicBaseUrl } from '../mail/templates'
import { sockets } from '../sockets'
import { hashPassword } from './auth'
import { publishCase, publishQueue } from './live'
import type { Role, User } from '../../shared/schemas/auth'
import type {
  AccountSummary, ListenerQuery, AcceptInvitationInput, AuditAction, AuditEntry, AuditQuery, Invitation, InvitationPreview, InviteInput, StaffRole, TeamMember,
} from '../../shared/schemas/team'

/** How long an invitation link works. */
export const INVITATION_HOURS = 72

const iso = (d: Date | string) => new Date(d).toISOString()
/** Only a SHA-256 of the token is stored: a leaked table row cannot be turned back into a working link. */
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex')

export async function recordAudit(
  e: { actorId: string | null; action: AuditAction; targetUserId?: string | null; targetName?: string | null; targetEmail?: string | null; details?: object },
  t?: Transaction,
): Promise<void> {
  await models().AuditLog.create(
    { actorId: e.actorId, action: e.action, targetUserId: e.targetUserId ?? null, targetName: e.targetName ?? null, targetEmail: e.targetEmail ?? null, details: (e.details ?? {}) as Record<string, unknown> },
    { transaction: t },
  )
}

interface MemberRow { user: UserModel; openCases: number }
const toMember = ({ user: u, openCases }: MemberRow): TeamMember => ({ id: u.id, name: u.name, email: u.email, role: u.role as StaffRole, active: u.active, createdAt: iso(u.createdAt), openCases })
const toAccount = ({ user: u, openCases }: MemberRow): AccountSummary => ({ id: u.id, name: u.name, email: u.email, role: u.role, active: u.active, createdAt: iso(u.createdAt), openCases })
const STAFF = ['advisor', 'supervisor']
/** A case still being worked on (not a draft, not closed). */
const OPEN = { [Op.notIn]: ['draft', 'closed'] }

/** Open cases of accounts: assigned to them for staff, their own for listeners. */
async function withOpenCases(users: UserModel[], t?: Transaction): Promise<MemberRow[]> {
  const { Case } = models()
  const counts = new Map<string, number>()
  for (const key of ['assigneeId', 'listenerId'] as const) {
    const ids = users.filter((u) => (key === 'listenerId') === (u.role === 'listener')).map((u) => u.id)
    if (!ids.length) continue
    const rows = (await Case.count({ where: { [key]: ids, status: OPEN }, group: [key], transaction: t })) as unknown as { [k: string]: string | number }[]
    for (const r of rows) counts.set(String(r[key]), Number(r.count))
  }
  return users.map((user) => ({ user, openCases: counts.get(user.id) ?? 0 }))
}

export async function listMembers(): Promise<TeamMember[]> {
  const users = await models().User.findAll({ where: { role: STAFF }, order: [['active', 'DESC'], ['name', 'ASC']] })
  return (await withOpenCases(users)).map(toMember)
}

/** One account, locked for a change: staff only (`staff`) or any account, listeners included (`any`). */
async function account(id: string, who: 'staff' | 'any', t?: Transaction): Promise<MemberRow> {
  const what = who === 'staff' ? 'That team member' : 'That account'
  if (!/^[0-9a-f-]{36}$/i.test(id)) throw notFound(what)
  const user = await models().User.findOne({
    where: { id, ...(who === 'staff' ? { role: STAFF } : {}) }, transaction: t, ...(t ? { lock: t.LOCK.UPDATE } : {}),
  })
  if (!user) throw notFound(what)
  return (await withOpenCases([user], t))[0]
}
const member = (id: string, t?: Transaction) => account(id, 'staff', t)

/** Listener accounts for the people list, by name or e-mail (case-insensitive part of either), paged. */
export async function listListeners(q: ListenerQuery): Promise<{ listeners: AccountSummary[]; total: number }> {
  const like = q.search ? `%${q.search.replace(/[\\%_]/g, (c) => `\\${c}`)}%` : null
  const { rows, count } = await models().User.findAndCountAll({
    where: {
      role: 'listener',
      ...(like ? { [Op.or]: [{ name: { [Op.iLike]: like } }, { email: { [Op.iLike]: like } }] } : {}),
      ...(q.active === undefined ? {} : { active: q.active }),
    },
    order: [['active', 'DESC'], [fn('lower', col('name')), 'ASC'], ['id', 'ASC']],
    limit: q.pageSize, offset: (q.page - 1) * q.pageSize,
  })
  return { total: count, listeners: (await withOpenCases(rows)).map(toAccount) }
}

/** Ends every session of an account (rows in the session store) except `keepSid`, and its live sockets from those sessions. */
export async function endSessions(userId: string, t: Transaction, afterCommit: (cb: () => void) => void, keepSid?: string): Promise<number> {
  const ended = await models().Session.destroy({ where: { userId, ...(keepSid ? { sid: { [Op.ne]: keepSid } } : {}) }, transaction: t })
  afterCommit(() => {
    const op = sockets()?.in(`user:${userId}`)
    if (!op) return
    ;(keepSid ? op.except(`session:${keepSid}`) : op).disconnectSockets(true)
  })
  return ended
}

// ----------------------------------------------------------------- invitations

/**
 * Whether the link has expired, by the database's clock (read with the row as the attribute `expired`),
 * so that every node agrees whatever its own clock says.
 */
const withExpired = { attributes: { include: [[dbPassed('TeamInvitation', 'expires_at'), 'expired']] as [ReturnType<typeof dbPassed>, string][] } }
const expired = (r: TeamInvitationModel) => {
  const e = r.get('expired' as never) as unknown
  if (typeof e !== 'boolean') throw new Error('an invitation row read without its expired attribute (withExpired)')
  return e
}
const stateOf = (r: TeamInvitationModel): Invitation['state'] =>
  r.acceptedAt ? 'accepted' : r.revokedAt ? 'revoked' : expired(r) ? 'expired' : 'pending'
const toInvitation = (r: TeamInvitationModel): Invitation => ({
  id: r.id, email: r.email, name: r.name, role: r.role,
  invitedBy: r.invitedBy ? { id: r.invitedBy, name: r.inviter?.name ?? '' } : null,
  createdAt: iso(r.createdAt), expiresAt: iso(r.expiresAt), state: stateOf(r),
})
const withInviter = { ...withExpired, include: [{ association: 'inviter', attributes: ['id', 'name'], required: false }] }
/** An e-mail address compared as the unique index on users compares it (lower-case). */
const emailIs = (email: string) => where(fn('lower', col('email')), Op.eq, fn('lower', email))
const emailTaken = async (email: string, t?: Transaction) => (await models().User.count({ where: emailIs(email), transaction: t })) > 0

/** Invitations not yet used, newest first (expired ones stay listed for a week so they can be sent again). */
export async function listInvitations(): Promise<Invitation[]> {
  const rows = await models().TeamInvitation.findAll({
    ...withInviter,
    where: { acceptedAt: null, revokedAt: null, expiresAt: { [Op.gt]: dbNowPlus(-7 * 24 * 3600) } },
    order: [['createdAt', 'DESC']],
  })
  return rows.map(toInvitation)
}

export const setPasswordUrl = (token: string) => `${publicBaseUrl()}/welcome/${token}`

/**
 * Invites a new advisor or supervisor: a one-time link (72 h) by e-mail. Inviting the same address
 * again withdraws the earlier link. The account is created only when the link is used.
 */
export async function invite(by: User, input: InviteInput): Promise<{ invitation: Invitation; token: string }> {
  if (await emailTaken(input.email)) throw conflict('There is already an account with that e-mail address', 'email_taken')
  const token = randomBytes(32).toString('base64url')
  const { TeamInvitation } = models()
  const id = await withTransaction(async (t) => {
    await TeamInvitation.update({ revokedAt: dbNow() }, { where: { [Op.and]: [emailIs(input.email), { acceptedAt: null, revokedAt: null }] }, transaction: t })
    const row = await TeamInvitation.create(
      { email: input.email, name: input.name, role: input.role, tokenHash: hashToken(token), invitedBy: by.id, expiresAt: dbNowPlus(INVITATION_HOURS * 3600) as unknown as Date },
      { transaction: t },
    )
    await queueEmail(
      { to: input.email, kind: 'invitation', vars: { recipientName: input.name, inviterName: by.name, role: input.role, setPasswordUrl: setPasswordUrl(token), expiresAt: row.expiresAt } },
      { transaction: t },
    )
    await recordAudit({ actorId: by.id, action: 'invitation.sent', targetName: input.name, targetEmail: input.email, details: { role: input.role, invitationId: row.id } }, t)
    return row.id
  })
  const row = await TeamInvitation.findByPk(id, withInviter)
  return { invitation: toInvitation(row!), token }
}

export async function revokeInvitation(by: User, id: string): Promise<void> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) throw notFound('That invitation')
  await withTransaction(async (t) => {
    const [, [row]] = await models().TeamInvitation.update(
      { revokedAt: dbNow() }, { where: { id, acceptedAt: null, revokedAt: null }, returning: true, transaction: t },
    )
    if (!row) throw notFound('An open invitation with that id')
    await recordAudit({ actorId: by.id, action: 'invitation.revoked', targetName: row.name, targetEmail: row.email, details: { invitationId: id } }, t)
  })
}

const gone = (why: string) => new AppError(why, { status: 410, code: 'link_gone' })

function usable(row: TeamInvitationModel | null): TeamInvitationModel {
  if (!row) throw notFound('That invitation link')
  if (row.acceptedAt) throw gone('This invitation link has already been used. Sign in with the password you chose, or ask a supervisor for a new invitation.')
  if (row.revokedAt) throw gone('This invitation was withdrawn or replaced by a newer one. Use the latest e-mail, or ask a supervisor to invite you again.')
  if (expired(row)) throw gone(`This invitation link has expired (links work for ${INVITATION_HOURS} hours). Ask a supervisor to send a new one.`)
  return row
}

/** What the set-password page shows; 404 for an unknown link, 410 for a used, withdrawn or expired one. */
export async function previewInvitation(token: string): Promise<InvitationPreview> {
  const r = usable(await models().TeamInvitation.findOne({ ...withExpired, where: { tokenHash: hashToken(token) } }))
  return { email: r.email, name: r.name, role: r.role, expiresAt: iso(r.expiresAt) }
}

/** Uses the link once: creates the account with the chosen password. The caller signs the new user in. */
export async function acceptInvitation(input: AcceptInvitationInput): Promise<User> {
  assertStrongPassword(input.password, input.name ? [input.name] : [])
  const passwordHash = await hashPassword(input.password)
  return withTransaction(async (t) => {
    const inv = usable(await models().TeamInvitation.findOne({ ...withExpired, where: { tokenHash: hashToken(input.token) }, transaction: t, lock: t.LOCK.UPDATE }))
    if (await emailTaken(inv.email, t)) throw conflict('There is already an account with this e-mail address; sign in with it instead', 'email_taken')
    const created = await models().User.create({ email: inv.email, name: input.name ?? inv.name, role: inv.role, passwordHash }, { transaction: t })
    const u: User = { id: created.id, email: created.email, name: created.name, role: created.role }
    await inv.update({ acceptedAt: dbNow(), acceptedUserId: u.id }, { transaction: t })
    await recordAudit({ actorId: u.id, action: 'invitation.accepted', targetUserId: u.id, targetName: u.name, targetEmail: u.email, details: { role: u.role, invitationId: inv.id, invitedBy: inv.invitedBy } }, t)
    return u
  })
}

// ----------------------------------------------------------------- accounts

/**
 * Switches an account off (a listener's or a team member's): its sessions end at once (rows
 * deleted, sockets disconnected). A team member's open cases go back to the queue unassigned, each
 * with an event in its history; a listener's cases stay as they are, readable by the desk.
 */
export async function deactivate(by: User, id: string): Promise<AccountSummary> {
  if (id === by.id) throw forbidden('You cannot switch off your own account; ask another supervisor')
  await withTransaction(async (t, afterCommit) => {
    const { user: m } = await account(id, 'any', t)
    if (!m.active) throw conflict(`${m.name}'s account is already switched off`, 'already_inactive')
    await m.update({ active: false }, { transaction: t })
    const cases = m.role === 'listener' ? [] : (await models().Case.update(
      { assigneeId: null, updatedAt: dbNow() }, { where: { assigneeId: id, status: OPEN }, returning: ['id'], transaction: t },
    ))[1]
    for (const c of cases) {
      await insertEvent({ caseId: c.id, actorId: by.id, kind: 'unassigned', data: { fromAssigneeId: id, fromAssigneeName: m.name, reason: 'account switched off', internal: true } }, t)
    }
    const sessionsEnded = await endSessions(id, t, afterCommit)
    await recordAudit({
      actorId: by.id, action: 'member.deactivated', targetUserId: id, targetName: m.name, targetEmail: m.email,
      details: m.role === 'listener' ? { role: m.role, sessionsEnded } : { casesReturned: cases.length },
    }, t)
    afterCommit(() => {
      for (const c of cases) {
        publishCase(c.id, { type: 'case.updated', caseId: c.id })
        publishQueue(c.id)
      }
    })
  })
  return toAccount(await account(id, 'any'))
}

export async function reactivate(by: User, id: string): Promise<AccountSummary> {
  await withTransaction(async (t) => {
    const { user: m } = await account(id, 'any', t)
    if (m.active) throw conflict(`${m.name}'s account is already on`, 'already_active')
    await m.update({ active: true }, { transaction: t })
    await recordAudit({ actorId: by.id, action: 'member.reactivated', targetUserId: id, targetName: m.name, targetEmail: m.email }, t)
  })
  return toAccount(await account(id, 'any'))
}

/** Advisor ⇄ supervisor. The new role applies from the member's next request (sessions read the role each time). */
export async function changeRole(by: User, id: string, role: StaffRole): Promise<TeamMember> {
  if (id === by.id) throw forbidden('You cannot change your own role; ask another supervisor')
  await withTransaction(async (t) => {
    const { user: m } = await member(id, t)
    if (m.role === role) throw conflict(`${m.name} is already a ${role}`, 'same_role')
    const from = m.role
    await m.update({ role }, { transaction: t })
    await recordAudit({ actorId: by.id, action: 'member.role_changed', targetUserId: id, targetName: m.name, targetEmail: m.email, details: { from, to: role } }, t)
  })
  return toMember(await member(id))
}

// ----------------------------------------------------------------- audit log

export async function listAudit(q: AuditQuery): Promise<{ entries: AuditEntry[]; total: number }> {
  const createdAt = { ...(q.from ? { [Op.gte]: new Date(q.from) } : {}), ...(q.to ? { [Op.lt]: new Date(q.to) } : {}) }
  const filter: WhereOptions<AuditLogModel> = {
    ...(q.actorId ? { actorId: q.actorId } : {}),
    ...(q.action ? { action: q.action } : {}),
    ...(q.targetUserId ? { targetUserId: q.targetUserId } : {}),
    ...(q.from || q.to ? { createdAt } : {}),
  }
  const { rows, count } = await models().AuditLog.findAndCountAll({
    where: filter,
    include: [
      { association: 'actor', attributes: ['id', 'name'], required: false },
      { association: 'targetUser', attributes: ['id', 'name', 'email'], required: false },
    ],
    order: [['createdAt', 'DESC'], ['id', 'DESC']],
    limit: q.pageSize, offset: (q.page - 1) * q.pageSize,
  })
  return {
    total: count,
    entries: rows.map((r) => {
      // the account's present name and address when it still exists, else those written with the entry
      const name = r.targetUser?.name ?? r.targetName
      const email = r.targetUser?.email ?? r.targetEmail
      return {
        id: String(r.id), action: r.action as AuditAction,
        actor: r.actorId ? { id: r.actorId, name: r.actor?.name ?? '' } : null,
        target: name || email ? { id: r.targetUserId, name: name ?? '', email: email ?? '' } : null,
        details: r.details, createdAt: iso(r.createdAt),
      }
    }),
  }
}
