import { assertStrongPassword } from '../auth/password-strength'
import { createHash, randomBytes } from 'node:crypto'
import { QueryTypes, type Transaction } from 'sequelize'
import { db } from '../db/sequelize'
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

const select = <T extends object>(sql: string, bind: unknown[], t?: Transaction) => db().query<T>(sql, { bind, type: QueryTypes.SELECT, transaction: t })
const iso = (d: Date | string) => new Date(d).toISOString()
/** Only a SHA-256 of the token is stored: a leaked table row cannot be turned back into a working link. */
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex')

export async function recordAudit(
  e: { actorId: string | null; action: AuditAction; targetUserId?: string | null; targetName?: string | null; targetEmail?: string | null; details?: object },
  t?: Transaction,
): Promise<void> {
  await db().query(
    'INSERT INTO audit_log (actor_id, action, target_user_id, target_name, target_email, details) VALUES ($1, $2, $3, $4, $5, $6)',
    { bind: [e.actorId, e.action, e.targetUserId ?? null, e.targetName ?? null, e.targetEmail ?? null, JSON.stringify(e.details ?? {})], transaction: t },
  )
}

interface MemberRow { id: string; name: string; email: string; role: Role; active: boolean; created_at: Date; open_cases: number }
const toMember = (r: MemberRow): TeamMember => ({ id: r.id, name: r.name, email: r.email, role: r.role as StaffRole, active: r.active, createdAt: iso(r.created_at), openCases: r.open_cases })
const toAccount = (r: MemberRow): AccountSummary => ({ id: r.id, name: r.name, email: r.email, role: r.role, active: r.active, createdAt: iso(r.created_at), openCases: r.open_cases })

export async function listMembers(): Promise<TeamMember[]> {
  const rows = await select<MemberRow>(
    `SELECT u.id, u.name, u.email, u.role, u.active, u.created_at,
            (SELECT count(*)::int FROM cases c WHERE c.assignee_id = u.id AND c.status NOT IN ('draft', 'closed')) AS open_cases
       FROM users u WHERE u.role IN ('advisor', 'supervisor') ORDER BY u.active DESC, u.name`,
    [],
  )
  return rows.map(toMember)
}

/** Open cases of an account: assigned to it for staff, its own for listeners. */
const openCasesOf = `(SELECT count(*)::int FROM cases c WHERE (CASE WHEN u.role = 'listener' THEN c.listener_id ELSE c.assignee_id END) = u.id
                        AND c.status NOT IN ('draft', 'closed'))`

/** One account, locked for a change: staff only (`staff`) or any account, listeners included (`any`). */
async function account(id: string, who: 'staff' | 'any', t?: Transaction): Promise<MemberRow> {
  const what = who === 'staff' ? 'That team member' : 'That account'
  if (!/^[0-9a-f-]{36}$/i.test(id)) throw notFound(what)
  const [row] = await select<MemberRow>(
    `SELECT u.id, u.name, u.email, u.role, u.active, u.created_at, ${openCasesOf} AS open_cases
       FROM users u WHERE u.id = $1 AND ($2::text = 'any' OR u.role IN ('advisor', 'supervisor')) ${t ? 'FOR UPDATE OF u' : ''}`,
    [id, who], t,
  )
  if (!row) throw notFound(what)
  return row
}
const member = (id: string, t?: Transaction) => account(id, 'staff', t)

/** Listener accounts for the people list, by name or e-mail (case-insensitive part of either), paged. */
export async function listListeners(q: ListenerQuery): Promise<{ listeners: AccountSummary[]; total: number }> {
  const rows = await select<MemberRow & { total: number }>(
    `SELECT u.id, u.name, u.email, u.role, u.active, u.created_at, ${openCasesOf} AS open_cases, count(*) OVER ()::int AS total
       FROM users u
      WHERE u.role = 'listener' AND ($1::text IS NULL OR u.name ILIKE '%' || $1 || '%' OR u.email ILIKE '%' || $1 || '%')
        AND ($2::boolean IS NULL OR u.active = $2)
      ORDER BY u.active DESC, lower(u.name), u.id LIMIT $3 OFFSET $4`,
    [q.search ? q.search.replace(/[\\%_]/g, (c) => `\\${c}`) : null, q.active ?? null, q.pageSize, (q.page - 1) * q.pageSize],
  )
  return { total: rows[0]?.total ?? 0, listeners: rows.map(toAccount) }
}

/** Ends every session of an account (rows in the session store) except `keepSid`, and its live sockets from those sessions. */
export async function endSessions(userId: string, t: Transaction, afterCommit: (cb: () => void) => void, keepSid?: string): Promise<number> {
  const ended = await select<{ sid: string }>(
    'DELETE FROM "session" WHERE user_id = $1 AND ($2::text IS NULL OR sid <> $2) RETURNING sid', [userId, keepSid ?? null], t,
  )
  afterCommit(() => {
    const op = sockets()?.in(`user:${userId}`)
    if (!op) return
    ;(keepSid ? op.except(`session:${keepSid}`) : op).disconnectSockets(true)
  })
  return ended.length
}

// ----------------------------------------------------------------- invitations

interface InvitationRow {
  id: string; email: string; name: string; role: StaffRole; invited_by: string | null; inviter_name: string | null
  created_at: Date; expires_at: Date; accepted_at: Date | null; revoked_at: Date | null
}
const stateOf = (r: InvitationRow): Invitation['state'] =>
  r.accepted_at ? 'accepted' : r.revoked_at ? 'revoked' : new Date(r.expires_at) <= new Date() ? 'expired' : 'pending'
const toInvitation = (r: InvitationRow): Invitation => ({
  id: r.id, email: r.email, name: r.name, role: r.role,
  invitedBy: r.invited_by ? { id: r.invited_by, name: r.inviter_name ?? '' } : null,
  createdAt: iso(r.created_at), expiresAt: iso(r.expires_at), state: stateOf(r),
})
const invitationSelect = `SELECT i.*, u.name AS inviter_name FROM team_invitations i LEFT JOIN users u ON u.id = i.invited_by`

/** Invitations not yet used, newest first (expired ones stay listed for a week so they can be sent again). */
export async function listInvitations(): Promise<Invitation[]> {
  const rows = await select<InvitationRow>(
    `${invitationSelect} WHERE i.accepted_at IS NULL AND i.revoked_at IS NULL AND i.expires_at > now() - interval '7 days' ORDER BY i.created_at DESC`,
    [],
  )
  return rows.map(toInvitation)
}

export const setPasswordUrl = (token: string) => `${publicBaseUrl()}/welcome/${token}`

/**
 * Invites a new advisor or supervisor: a one-time link (72 h) by e-mail. Inviting the same address
 * again withdraws the earlier link. The account is created only when the link is used.
 */
export async function invite(by: User, input: InviteInput): Promise<{ invitation: Invitation; token: string }> {
  const [taken] = await select<{ id: string }>('SELECT id FROM users WHERE lower(email) = lower($1)', [input.email])
  if (taken) throw conflict('There is already an account with that e-mail address', 'email_taken')
  const token = randomBytes(32).toString('base64url')
  const id = await withTransaction(async (t) => {
    await db().query(
      `UPDATE team_invitations SET revoked_at = now() WHERE lower(email) = lower($1) AND accepted_at IS NULL AND revoked_at IS NULL`,
      { bind: [input.email], transaction: t },
    )
    const [row] = await select<{ id: string; expires_at: Date }>(
      `INSERT INTO team_invitations (email, name, role, token_hash, invited_by, expires_at)
       VALUES ($1, $2, $3, $4, $5, now() + make_interval(hours => $6)) RETURNING id, expires_at`,
      [input.email, input.name, input.role, hashToken(token), by.id, INVITATION_HOURS], t,
    )
    await queueEmail(
      { to: input.email, kind: 'invitation', vars: { recipientName: input.name, inviterName: by.name, role: input.role, setPasswordUrl: setPasswordUrl(token), expiresAt: row.expires_at } },
      { transaction: t },
    )
    await recordAudit({ actorId: by.id, action: 'invitation.sent', targetName: input.name, targetEmail: input.email, details: { role: input.role, invitationId: row.id } }, t)
    return row.id
  })
  const [row] = await select<InvitationRow>(`${invitationSelect} WHERE i.id = $1`, [id])
  return { invitation: toInvitation(row), token }
}

export async function revokeInvitation(by: User, id: string): Promise<void> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) throw notFound('That invitation')
  await withTransaction(async (t) => {
    const [row] = await select<InvitationRow>(
      `UPDATE team_invitations SET revoked_at = now() WHERE id = $1 AND accepted_at IS NULL AND revoked_at IS NULL RETURNING *`, [id], t,
    )
    if (!row) throw notFound('An open invitation with that id')
    await recordAudit({ actorId: by.id, action: 'invitation.revoked', targetName: row.name, targetEmail: row.email, details: { invitationId: id } }, t)
  })
}

const gone = (why: string) => new AppError(why, { status: 410, code: 'link_gone' })

function usable(row: InvitationRow | undefined): InvitationRow {
  if (!row) throw notFound('That invitation link')
  if (row.accepted_at) throw gone('This invitation link has already been used. Sign in with the password you chose, or ask a supervisor for a new invitation.')
  if (row.revoked_at) throw gone('This invitation was withdrawn or replaced by a newer one. Use the latest e-mail, or ask a supervisor to invite you again.')
  if (new Date(row.expires_at) <= new Date()) throw gone(`This invitation link has expired (links work for ${INVITATION_HOURS} hours). Ask a supervisor to send a new one.`)
  return row
}

/** What the set-password page shows; 404 for an unknown link, 410 for a used, withdrawn or expired one. */
export async function previewInvitation(token: string): Promise<InvitationPreview> {
  const [row] = await select<InvitationRow>(`${invitationSelect} WHERE i.token_hash = $1`, [hashToken(token)])
  const r = usable(row)
  return { email: r.email, name: r.name, role: r.role, expiresAt: iso(r.expires_at) }
}

/** Uses the link once: creates the account with the chosen password. The caller signs the new user in. */
export async function acceptInvitation(input: AcceptInvitationInput): Promise<User> {
  assertStrongPassword(input.password, input.name ? [input.name] : [])
  const passwordHash = await hashPassword(input.password)
  return withTransaction(async (t) => {
    const [row] = await select<InvitationRow>(`${invitationSelect} WHERE i.token_hash = $1 FOR UPDATE OF i`, [hashToken(input.token)], t)
    const inv = usable(row)
    const [taken] = await select<{ id: string }>('SELECT id FROM users WHERE lower(email) = lower($1)', [inv.email], t)
    if (taken) throw conflict('There is already an account with this e-mail address; sign in with it instead', 'email_taken')
    const [u] = await select<User>(
      `INSERT INTO users (email, name, role, password_hash) VALUES ($1, $2, $3, $4) RETURNING id, email, name, role`,
      [inv.email, input.name ?? inv.name, inv.role, passwordHash], t,
    )
    await db().query('UPDATE team_invitations SET accepted_at = now(), accepted_user_id = $2 WHERE id = $1', { bind: [inv.id, u.id], transaction: t })
    await recordAudit({ actorId: u.id, action: 'invitation.accepted', targetUserId: u.id, targetName: u.name, targetEmail: u.email, details: { role: u.role, invitationId: inv.id, invitedBy: inv.invited_by } }, t)
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
    const m = await account(id, 'any', t)
    if (!m.active) throw conflict(`${m.name}'s account is already switched off`, 'already_inactive')
    await db().query('UPDATE users SET active = false, updated_at = now() WHERE id = $1', { bind: [id], transaction: t })
    const cases = m.role === 'listener' ? [] : await select<{ id: string }>(
      `UPDATE cases SET assignee_id = NULL, updated_at = now() WHERE assignee_id = $1 AND status NOT IN ('draft', 'closed') RETURNING id`, [id], t,
    )
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
    const m = await account(id, 'any', t)
    if (m.active) throw conflict(`${m.name}'s account is already on`, 'already_active')
    await db().query('UPDATE users SET active = true, updated_at = now() WHERE id = $1', { bind: [id], transaction: t })
    await recordAudit({ actorId: by.id, action: 'member.reactivated', targetUserId: id, targetName: m.name, targetEmail: m.email }, t)
  })
  return toAccount(await account(id, 'any'))
}

/** Advisor ⇄ supervisor. The new role applies from the member's next request (sessions read the role each time). */
export async function changeRole(by: User, id: string, role: StaffRole): Promise<TeamMember> {
  if (id === by.id) throw forbidden('You cannot change your own role; ask another supervisor')
  await withTransaction(async (t) => {
    const m = await member(id, t)
    if (m.role === role) throw conflict(`${m.name} is already a ${role}`, 'same_role')
    await db().query('UPDATE users SET role = $2, updated_at = now() WHERE id = $1', { bind: [id, role], transaction: t })
    await recordAudit({ actorId: by.id, action: 'member.role_changed', targetUserId: id, targetName: m.name, targetEmail: m.email, details: { from: m.role, to: role } }, t)
  })
  return toMember(await member(id))
}

// ----------------------------------------------------------------- audit log

interface AuditRow {
  id: string; action: AuditAction; actor_id: string | null; actor_name: string | null; target_user_id: string | null
  target_name: string | null; target_email: string | null; details: Record<string, unknown>; created_at: Date; total: number
}

export async function listAudit(q: AuditQuery): Promise<{ entries: AuditEntry[]; total: number }> {
  const rows = await select<AuditRow>(
    `SELECT a.id, a.action, a.actor_id, u.name AS actor_name, a.target_user_id, coalesce(tu.name, a.target_name) AS target_name,
            coalesce(tu.email, a.target_email) AS target_email, a.details, a.created_at, count(*) OVER ()::int AS total
       FROM audit_log a LEFT JOIN users u ON u.id = a.actor_id LEFT JOIN users tu ON tu.id = a.target_user_id
      WHERE ($1::uuid IS NULL OR a.actor_id = $1) AND ($2::text IS NULL OR a.action = $2)
        AND ($3::timestamptz IS NULL OR a.created_at >= $3) AND ($4::timestamptz IS NULL OR a.created_at < $4)
        AND ($5::uuid IS NULL OR a.target_user_id = $5)
      ORDER BY a.created_at DESC, a.id DESC LIMIT $6 OFFSET $7`,
    [q.actorId ?? null, q.action ?? null, q.from ?? null, q.to ?? null, q.targetUserId ?? null, q.pageSize, (q.page - 1) * q.pageSize],
  )
  return {
    total: rows[0]?.total ?? 0,
    entries: rows.map((r) => ({
      id: String(r.id), action: r.action,
      actor: r.actor_id ? { id: r.actor_id, name: r.actor_name ?? '' } : null,
      target: r.target_name || r.target_email ? { id: r.target_user_id, name: r.target_name ?? '', email: r.target_email ?? '' } : null,
      details: r.details, createdAt: iso(r.created_at),
    })),
  }
}
