import { QueryTypes, type Transaction } from 'sequelize'
import { randomBytes } from 'node:crypto'
import { db } from '../db/sequelize'
import type { CaseDetail, CaseStatus, CaseSummary } from '../../shared/schemas/case'

const q = <T extends object>(sql: string, bind: unknown[], t?: Transaction) => db().query<T>(sql, { bind, type: QueryTypes.SELECT, transaction: t })

interface CaseRow {
  id: string; title: string; description: string; answers: CaseDetail['answers']; status: CaseStatus; score: number | null
  listener_id: string; listener_name: string; assignee_id: string | null; assignee_name: string | null
  room_id: string; room_name: string; room_revision: number; length: number; width: number; height: number
  flags: { id: string; severity: string }[] | null
  created_at: Date; submitted_at: Date | null; waiting_since: Date | null; last_activity_at: Date
}

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null)

export const toSummary = (r: CaseRow): CaseSummary => ({
  id: r.id,
  title: r.title,
  status: r.status,
  score: r.score,
  listener: { id: r.listener_id, name: r.listener_name },
  assignee: r.assignee_id ? { id: r.assignee_id, name: r.assignee_name ?? '' } : null,
  room: { id: r.room_id, name: r.room_name, revision: r.room_revision, length: Number(r.length), width: Number(r.width), height: Number(r.height) },
  flags: r.flags ?? [],
  createdAt: iso(r.created_at)!,
  submittedAt: iso(r.submitted_at),
  waitingSince: iso(r.waiting_since),
  lastActivityAt: iso(r.last_activity_at)!,
})

const toDetail = (r: CaseRow): CaseDetail => ({ ...toSummary(r), description: r.description, answers: r.answers, listenerId: r.listener_id })

/**
 * The columns every case listing shows; the flags come from the latest triage snapshot. The reply-by-e-mail
 * token is a secret of the mail path (server/mail/outbox.ts reads it itself) and is never selected here,
 * so no case shape can carry it to a browser.
 */
export const caseSelect = `
  SELECT c.id, c.title, c.description, c.answers, c.status, c.score, c.listener_id, l.name AS listener_name,
         c.assignee_id, a.name AS assignee_name, c.room_id, r.name AS room_name, c.room_revision,
         (rr.body->>'length')::float AS length, (rr.body->>'width')::float AS width, (rr.body->>'height')::float AS height,
         c.flags,
         c.created_at, c.submitted_at, c.waiting_since, c.last_activity_at
    FROM cases c
    JOIN users l ON l.id = c.listener_id
    LEFT JOIN users a ON a.id = c.assignee_id
    JOIN rooms r ON r.id = c.room_id
    JOIN room_revisions rr ON rr.room_id = c.room_id AND rr.revision = c.room_revision`

export async function insertCase(input: { listenerId: string; roomId: string; roomRevision: number; title: string; description: string; answers: object }, t?: Transaction): Promise<string> {
  const [row] = await q<{ id: string }>(
    `INSERT INTO cases (listener_id, room_id, room_revision, title, description, answers, reply_token)
     VALUES ($1, $2, $3, $4, $5, $6, $7) RETURNING id`,
    [input.listenerId, input.roomId, input.roomRevision, input.title, input.description, JSON.stringify(input.answers), randomBytes(24).toString('hex')],
    t,
  )
  return row.id
}

export async function findCase(id: string, t?: Transaction): Promise<CaseDetail | null> {
  const rows = await q<CaseRow>(`${caseSelect} WHERE c.id = $1`, [id], t)
  return rows[0] ? toDetail(rows[0]) : null
}

export async function findCaseIdByReplyToken(token: string): Promise<{ id: string; listenerId: string } | null> {
  const rows = await q<{ id: string; listener_id: string }>('SELECT id, listener_id FROM cases WHERE reply_token = $1', [token])
  return rows[0] ? { id: rows[0].id, listenerId: rows[0].listener_id } : null
}

export async function listCasesOfListener(listenerId: string): Promise<CaseSummary[]> {
  const rows = await q<CaseRow>(`${caseSelect} WHERE c.listener_id = $1 ORDER BY c.last_activity_at DESC`, [listenerId])
  return rows.map(toSummary)
}

/** Moves a case from exactly `from` to `to`; false when someone else moved it first (a stale transition). */
export async function updateStatus(id: string, from: CaseStatus, to: CaseStatus, t: Transaction): Promise<boolean> {
  const rows = await q<{ id: string }>(
    `UPDATE cases SET status = $3::case_status, updated_at = now(), last_activity_at = now(),
            submitted_at = CASE WHEN $3::case_status = 'submitted' AND submitted_at IS NULL THEN now() ELSE submitted_at END,
            closed_at = CASE WHEN $3::case_status = 'closed' THEN now() ELSE NULL END,
            waiting_since = CASE WHEN $3::case_status IN ('submitted', 'in_review') THEN COALESCE(waiting_since, now()) ELSE NULL END
      WHERE id = $1 AND status = $2::case_status RETURNING id`,
    [id, from, to],
    t,
  )
  return rows.length === 1
}

export async function updateCaseFields(id: string, patch: { title?: string; description?: string; answers?: object; roomId?: string; roomRevision?: number }, t?: Transaction) {
  await q(
    `UPDATE cases SET title = COALESCE($2, title), description = COALESCE($3, description), answers = COALESCE($4::jsonb, answers),
            room_id = COALESCE($5, room_id), room_revision = COALESCE($6, room_revision), updated_at = now(), last_activity_at = now()
      WHERE id = $1 RETURNING id`,
    [id, patch.title ?? null, patch.description ?? null, patch.answers ? JSON.stringify(patch.answers) : null, patch.roomId ?? null, patch.roomRevision ?? null],
    t,
  )
}

export async function setAssignee(id: string, assigneeId: string | null, expectedAssignee: string | null | undefined, t: Transaction): Promise<boolean> {
  const rows = await q<{ id: string }>(
    `UPDATE cases SET assignee_id = $2, updated_at = now(), last_activity_at = now()
      WHERE id = $1 AND ($3::boolean IS FALSE OR assignee_id IS NOT DISTINCT FROM $4::uuid) RETURNING id`,
    [id, assigneeId, expectedAssignee !== undefined, expectedAssignee ?? null],
    t,
  )
  return rows.length === 1
}

/** After a message: the team's reply stops the "waiting for us" clock and counts as a first response; a listener's starts it. */
export async function touchAfterMessage(id: string, by: 'team' | 'listener', t: Transaction) {
  if (by === 'team') {
    await q(`UPDATE cases SET last_activity_at = now(), waiting_since = NULL, first_response_at = COALESCE(first_response_at, now()) WHERE id = $1 RETURNING id`, [id], t)
  } else {
    await q(`UPDATE cases SET last_activity_at = now(), waiting_since = CASE WHEN status IN ('submitted', 'in_review') THEN COALESCE(waiting_since, now()) ELSE waiting_since END WHERE id = $1 RETURNING id`, [id], t)
  }
}

export async function setScore(id: string, score: number, flags: { id: string; severity: string }[], t?: Transaction) {
  await q('UPDATE cases SET score = $2, flag_ids = $3, flags = $4 WHERE id = $1 RETURNING id', [id, score, flags.map((f) => f.id), JSON.stringify(flags)], t)
}

export async function openCasesForRoom(roomId: string, t?: Transaction): Promise<{ id: string; status: CaseStatus }[]> {
  return q<{ id: string; status: CaseStatus }>(`SELECT id, status FROM cases WHERE room_id = $1 AND status <> 'closed'`, [roomId], t)
}
