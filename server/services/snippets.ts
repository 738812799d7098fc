import { QueryTypes } from 'sequelize'
import { db } from '../db/sequelize'
import { conflict, notFound } from '../errors'
import { fillPlaceholders, type SnippetInput, type SnippetPlaceholder } from '../../shared/schemas/snippet'
import type { User } from '../../shared/schemas/auth'
import { readableCase } from './access'
import { latestTriage } from './triage'

export interface Snippet { id: string; title: string; body: string; updatedAt: string }

const rowToSnippet = (r: { id: string; title: string; body: string; updated_at: Date }): Snippet => ({ id: r.id, title: r.title, body: r.body, updatedAt: new Date(r.updated_at).toISOString() })

export async function listSnippets(): Promise<Snippet[]> {
  const rows = await db().query<{ id: string; title: string; body: string; updated_at: Date }>('SELECT id, title, body, updated_at FROM reply_snippets ORDER BY lower(title)', { type: QueryTypes.SELECT })
  return rows.map(rowToSnippet)
}

export async function saveSnippet(user: User, input: SnippetInput, id?: string): Promise<Snippet> {
  try {
    const rows = id
      ? await db().query<{ id: string; title: string; body: string; updated_at: Date }>('UPDATE reply_snippets SET title = $2, body = $3, updated_at = now() WHERE id = $1 RETURNING id, title, body, updated_at', { bind: [id, input.title, input.body], type: QueryTypes.SELECT })
      : await db().query<{ id: string; title: string; body: string; updated_at: Date }>('INSERT INTO reply_snippets (title, body, created_by) VALUES ($1, $2, $3) RETURNING id, title, body, updated_at', { bind: [input.title, input.body, user.id], type: QueryTypes.SELECT })
    if (!rows[0]) throw notFound('That snippet')
    return rowToSnippet(rows[0])
  } catch (e) {
    if ((e as { parent?: { code?: string } }).parent?.code === '23505') throw conflict('A snippet with that title exists already', 'duplicate')
    throw e
  }
}

export async function deleteSnippet(id: string): Promise<void> {
  await db().query('DELETE FROM reply_snippets WHERE id = $1', { bind: [id] })
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
  return (await listSnippets()).map((s) => ({ ...s, filled: fillPlaceholders(s.body, values) }))
}
