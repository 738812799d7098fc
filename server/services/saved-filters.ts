import { fn, col } from 'sequelize'
import { models } from '../db/models'
import { conflict } from '../errors'
import type { SavedFilterInput } from '../../shared/schemas/queue'

export interface SavedFilter { id: string; name: string; query: SavedFilterInput['query'] }

export async function listSavedFilters(userId: string): Promise<SavedFilter[]> {
  const rows = await models().SavedFilter.findAll({ where: { userId }, attributes: ['id', 'name', 'query'], order: [[fn('lower', col('name')), 'ASC']] })
  return rows.map((r) => ({ id: r.id, name: r.name, query: r.query }))
}

export async function saveFilter(userId: string, input: SavedFilterInput): Promise<SavedFilter> {
  try {
    const r = await models().SavedFilter.create({ userId, name: input.name, query: input.query })
    return { id: r.id, name: r.name, query: r.query }
  } catch (e) {
    if ((e as { parent?: { code?: string } }).parent?.code === '23505') throw conflict('You already have a filter with that name', 'duplicate')
    throw e
  }
}

/** Deletes only the caller's own filter; someone else's id simply matches nothing. */
export async function deleteSavedFilter(userId: string, id: string): Promise<boolean> {
  return (await models().SavedFilter.destroy({ where: { id, userId } })) > 0
}
