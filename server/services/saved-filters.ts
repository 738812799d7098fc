import { QueryTypes } from 'sequelize'
import { db } from '../db/sequelize'
import { conflict } from '../errors'
import type { SavedFilterInput } from '../../shared/schemas/queue'

export interface SavedFilter { id: string; name: string; query: SavedFilterInput['query'] }

export async function listSavedFilters(userId: string): Promise<SavedFilter[]> {
  return db().query<SavedFilter>('SELECT id, name, query FROM saved_filters WHERE user_id = $1 ORDER BY lower(name)', { bind: [userId], type: QueryTypes.SELECT })
}

export async function saveFilter(userId: string, input: SavedFilterInput): Promise<SavedFilter> {
  try {
    const [row] = await db().query<SavedFilter>('INSERT INTO saved_filters (user_id, name, query) VALUES ($1, $2, $3) RETURNING id, name, query', {
      bind: [userId, input.name, JSON.stringify(input.query)], type: QueryTypes.SELECT,
    })
    return row
  } catch (e) {
    if ((e as { parent?: { code?: string } }).parent?.code === '23505') throw conflict('You already have a filter with that name', 'duplicate')
    throw e
  }
}

/** Deletes only the caller's own filter; someone else's id simply matches nothing. */
export async function deleteSavedFilter(userId: string, id: string): Promise<boolean> {
  const rows = await db().query<{ id: string }>('DELETE FROM saved_filters WHERE id = $1 AND user_id = $2 RETURNING id', { bind: [id, userId], type: QueryTypes.SELECT })
  return rows.length > 0
}
