import { fn, col } from 'sequelize'
import { models, type ReplySnippetModel } from '../db/models'
import { dbNow } from '../db/models/now'
import { findUserById } from '../data/users'
import { conflict, notFound } from '../errors'
import { fillPlaceholders, type SnippetInput, type SnippetPlaceholder } from '../../shared/schemas/snippet'
import type { User } from '../../shared/schemas/auth'
import { readableCase } from './access'
import { latestTriage } from './triage'

export interface Snippet { id: string; title: string; body: string; updatedAt: string }

const rowToSnippet = (r: ReplySnippetModel): Snippet => ({ id: r.id, title: r.title, body: r.body, updatedAt: r.updatedAt.toISOString() })

export async function listSnippets(): Promise<Snippet[]> {
  const rows = await models().ReplySnippet.findAll({ order: [[fn('lower', col('title')), 'ASC']] })
  return rows.map(rowToSnippet)
}

export async function saveSnippet(user: User, input: SnippetInput, id?: string): Promise<Snippet> {
  try {
    const Snippet = models().ReplySnippet
    const rows = id
      ? (await Snippet.update({ title: input.title, body: input.body, updatedAt: dbNow() }, { where: { id }, returning: true }))[1]
      : [await Snippet.create({ title: input.title, body: input.body, createdBy: user.id })]
    if (!rows[0]) throw notFound('That snippet')
    return rowToSnippet(rows[0])
  } catch (e) {
    if ((e as { parent?: { code?: string } }).parent?.code === '23505') throw conflict('A snippet with that title exists already', 'duplicate')
    throw e
  }
}

export async function deleteSnippet(id: string): Promise<void> {
  await models().ReplySnippet.destroy({ where: { id } })
}

/** Values for the placeholders, from the case, its room and its latest triage. */
export async function placeholderValues(user: User, caseId: string): Promise<Partial<Record<SnippetPlaceholder, string>>> {
  const c = await readableCase(user, caseId)
  const triage = await latestTriage(caseId)
  const listener = await findUserById(c.listenerId)
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
