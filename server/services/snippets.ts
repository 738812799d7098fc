import { Op, col, fn, type Transaction } from 'sequelize'
import { models, type ReplySnippetModel } from '../db/models'
import { dbNow } from '../db/models/now'
import { withTransaction } from '../db/transaction'
import { conflict, notFound } from '../errors'
import { fillPlaceholders, type Snippet, type SnippetInput, type SnippetPlaceholder, type SnippetScope, type SnippetUpdate } from '../../shared/schemas/snippet'
import type { User } from '../../shared/schemas/auth'
import { readableCase } from './access'
import { recordAudit } from './team'
import { latestTriage } from './triage'

export type { Snippet }

const toSnippet = (r: ReplySnippetModel): Snippet => ({
  id: r.id, title: r.title, body: r.body, scope: r.scope,
  author: r.createdBy ? { id: r.createdBy, name: r.author?.name ?? '' } : null,
  updatedAt: new Date(r.updatedAt).toISOString(),
})
const withAuthor = { include: [{ association: 'author', attributes: ['id', 'name'], required: false }] }
/** The one visibility rule: the team's snippets and the user's own personal ones. Someone else's personal snippet does not exist for them. */
const visibleTo = (user: User) => ({ [Op.or]: [{ scope: 'team' }, { createdBy: user.id }] })
const reload = async (id: string, t: Transaction) => toSnippet((await models().ReplySnippet.findByPk(id, { ...withAuthor, transaction: t }))!)

const duplicate = (e: unknown) => (e as { parent?: { code?: string } }).parent?.code === '23505'
const duplicateError = (scope: SnippetScope) =>
  conflict(scope === 'team' ? 'The team already has a snippet with that title' : 'You already have a snippet with that title', 'duplicate')

/** The team's snippets and the user's own, by title. */
export async function listSnippets(user: User): Promise<Snippet[]> {
  const rows = await models().ReplySnippet.findAll({ ...withAuthor, where: visibleTo(user), order: [[fn('lower', col('title')), 'ASC'], ['scope', 'ASC']] })
  return rows.map(toSnippet)
}

/** A snippet the user may change, locked for the change; 404 for unknown ids and for colleagues' personal snippets alike. */
async function changeable(user: User, id: string, t: Transaction): Promise<ReplySnippetModel> {
  const row = /^[0-9a-f-]{36}$/i.test(id) ? await models().ReplySnippet.findOne({ where: { id, ...visibleTo(user) }, transaction: t, lock: t.LOCK.UPDATE }) : null
  if (!row) throw notFound('That snippet')
  return row
}

export async function createSnippet(user: User, input: SnippetInput): Promise<Snippet> {
  const scope = input.scope ?? 'personal'
  try {
    return await withTransaction(async (t) => {
      const row = await models().ReplySnippet.create({ title: input.title, body: input.body, scope, createdBy: user.id }, { transaction: t })
      if (scope === 'team') await recordAudit({ actorId: user.id, action: 'snippet.team_created', details: { snippetId: row.id, title: row.title } }, t)
      return reload(row.id, t)
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
      const earlier = { title: before.title, body: before.body }
      await before.update({ title: input.title, body: input.body, updatedAt: dbNow() }, { transaction: t })
      if (before.scope === 'team') {
        await recordAudit({
          actorId: user.id, action: 'snippet.team_changed',
          details: { snippetId: id, title: input.title, before: earlier, authorId: before.createdBy },
        }, t)
      }
      return reload(id, t)
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
    await row.destroy({ transaction: t })
    if (row.scope === 'team') {
      await recordAudit({ actorId: user.id, action: 'snippet.team_deleted', details: { snippetId: id, title: row.title, body: row.body, authorId: row.createdBy } }, t)
    }
  })
}

/** Values for the placeholders, from the case, its room and its latest triage. */
export async function placeholderValues(user: User, caseId: string): Promise<Partial<Record<SnippetPlaceholder, string>>> {
  const c = await readableCase(user, caseId)
  const triage = await latestTriage(caseId)
  const listener = await models().User.findByPk(c.listenerId, { attributes: ['name'] })
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
