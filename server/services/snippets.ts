import { QueryTypes, type Transaction } from 'sequelize'
import { db } from '../db/sequelize'
import { withTransaction } from '../db/transaction'
import { conflict, notFound } from '../errors'
import { fillPlaceholders, type Snippet, type SnippetInput, type SnippetPlaceholder, type SnippetScope, type SnippetUpdate } from '../../shared/schemas/snippet'
import type { User } from '../../shared/schemas/auth'
import { readableCase } from './access'
import { recordAudit } from './team'
import { latestTriage } from './triage'

export type { Snippet }

interface SnippetRow { id: string; title: string; body: string; scope: SnippetScope; created_by: string | null; author_name: string | null; updated_at: Date }
const rowToSnippet = (r: SnippetRow): Snippet => ({
  id: r.id, title: r.title, body: r.body, scope: r.scope,
  author: r.created_by ? { id: r.created_by, name: r.author_name ?? '' } : null,
  updatedAt: new Date(r.updated_at).toISOString(),
})
const select = (sql: string, bind: unknown[], t?: Transaction) => db().query<SnippetRow>(sql, { bind, type: QueryTypes.SELECT, transaction: t })
const snippetSelect = 'SELECT s.id, s.title, s.body, s.scope, s.created_by, u.name AS author_name, s.updated_at FROM reply_snippets s LEFT JOIN users u ON u.id = s.created_by'
/** The one visibility rule: the team's snippets and the user's own personal ones. Someone else's personal snippet does not exist for them. */
const visibleTo = "(s.scope = 'team' OR s.created_by = $1)"

const duplicate = (e: unknown) => (e as { parent?: { code?: string } }).parent?.code === '23505'
const duplicateError = (scope: SnippetScope) =>
  conflict(scope === 'team' ? 'The team already has a snippet with that title' : 'You already have a snippet with that title', 'duplicate')

/** The team's snippets and the user's own, by title. */
export async function listSnippets(user: User): Promise<Snippet[]> {
  return (await select(`${snippetSelect} WHERE ${visibleTo} ORDER BY lower(s.title), s.scope`, [user.id])).map(rowToSnippet)
}

/** A snippet the user may change, locked for the change; 404 for unknown ids and for colleagues' personal snippets alike. */
async function changeable(user: User, id: string, t: Transaction): Promise<SnippetRow> {
  const [row] = await select(`${snippetSelect} WHERE s.id = $2 AND ${visibleTo} FOR UPDATE OF s`, [user.id, id], t)
  if (!row) throw notFound('That snippet')
  return row
}

export async function createSnippet(user: User, input: SnippetInput): Promise<Snippet> {
  const scope = input.scope ?? 'personal'
  try {
    return await withTransaction(async (t) => {
      const [row] = await select(
        `WITH s AS (INSERT INTO reply_snippets (title, body, scope, created_by) VALUES ($1, $2, $3, $4) RETURNING *)
         SELECT s.id, s.title, s.body, s.scope, s.created_by, u.name AS author_name, s.updated_at FROM s LEFT JOIN users u ON u.id = s.created_by`,
        [input.title, input.body, scope, user.id], t,
      )
      if (scope === 'team') await recordAudit({ actorId: user.id, action: 'snippet.team_created', details: { snippetId: row.id, title: row.title } }, t)
      return rowToSnippet(row)
    })
  } catch (e) {
    if (duplicate(e)) throw duplicateError(scope)
    throw e
  }
}

/** Personal snippets: their author only. Team snippets: any advisor, with the earlier words kept in the audit log. */
export async function updateSnippet(user: User, id: string, input: SnippetUpdate): Promise<Snippet> {
  let scope: SnippetScope = 'personal'
  try {
    return await withTransaction(async (t) => {
      const before = await changeable(user, id, t)
      scope = before.scope
      await db().query('UPDATE reply_snippets SET title = $2, body = $3, updated_at = now() WHERE id = $1', { bind: [id, input.title, input.body], transaction: t })
      if (before.scope === 'team') {
        await recordAudit({
          actorId: user.id, action: 'snippet.team_changed',
          details: { snippetId: id, title: input.title, before: { title: before.title, body: before.body }, authorId: before.created_by },
        }, t)
      }
      const [row] = await select(`${snippetSelect} WHERE s.id = $1`, [id], t)
      return rowToSnippet(row)
    })
  } catch (e) {
    if (duplicate(e)) throw duplicateError(scope)
    throw e
  }
}

/** 404 when there is no such snippet for this user; a team snippet's words stay in the audit log. */
export async function deleteSnippet(user: User, id: string): Promise<void> {
  await withTransaction(async (t) => {
    const row = await changeable(user, id, t)
    await db().query('DELETE FROM reply_snippets WHERE id = $1', { bind: [id], transaction: t })
    if (row.scope === 'team') {
      await recordAudit({ actorId: user.id, action: 'snippet.team_deleted', details: { snippetId: id, title: row.title, body: row.body, authorId: row.created_by } }, t)
    }
  })
}

/** Values for the placeholders, from the case, its room and its latest triage. */
export async function placeholderValues(user: User, caseId: string): Promise<Partial<Record<SnippetPlaceholder, string>>> {
  const c = await readableCase(user, caseId)
  const triage = await latestTriage(caseId)
  const [listener] = await db().query<{ name: string }>('SELECT name FROM users WHERE id = $1', { bind: [c.listenerId], type: QueryTypes.SELECT })
  const modes = (triage?.modes ?? []) as { kind: string; hz: number }[]
  const firstAxial = modes.find((m) => m.kind === 'axial')
  const schroeder = (triage?.reverberation as { schroederHz?: number } | undefined)?.schroederHz
  return {
    'listener.name': listener?.name,
    'case.title': c.title,
    'room.name': c.room.name,
    'room.dimensions': `${c.room.length} × ${c.room.width} × ${c.room.height} m`,
    'room.firstAxialHz': firstAxial ? `${firstAxial.hz.toFixed(1)} Hz` : undefined,
    'room.schroederHz': schroeder ? `${Math.round(schroeder)} Hz` : undefined,
    'advisor.name': user.name,
  }
}

export async function snippetsForCase(user: User, caseId: string) {
  const values = await placeholderValues(user, caseId)
  return (await listSnippets(user)).map((s) => ({ ...s, filled: fillPlaceholders(s.body, values) }))
}
