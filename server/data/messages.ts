import { QueryTypes, type Transaction } from 'sequelize'
import { db } from '../db/sequelize'
import { visibleTo, type Audience } from './visibility'

export interface MessageRow {
  id: string; case_id: string; author_id: string | null; author_name: string | null; author_role: string | null
  body: string; internal: boolean; source: 'app' | 'email'; created_at: Date; file_ids: string[] | null
}

export async function insertMessage(m: { caseId: string; authorId: string | null; body: string; internal: boolean; source: 'app' | 'email' }, t: Transaction): Promise<string> {
  const [row] = await db().query<{ id: string }>(
    'INSERT INTO messages (case_id, author_id, body, internal, source) VALUES ($1, $2, $3, $4, $5) RETURNING id',
    { bind: [m.caseId, m.authorId, m.body, m.internal, m.source], type: QueryTypes.SELECT, transaction: t },
  )
  return row.id
}

/** The thread as `audience` may see it (the visibility rule: ./visibility.ts). */
export async function listMessages(caseId: string, audience: Audience, onlyId?: string): Promise<MessageRow[]> {
  return db().query<MessageRow>(
    `SELECT m.id, m.case_id, m.author_id, u.name AS author_name, u.role AS author_role, m.body, m.internal, m.source, m.created_at,
            (SELECT array_agg(f.id ORDER BY f.created_at) FROM files f WHERE f.message_id = m.id) AS file_ids
       FROM messages m LEFT JOIN users u ON u.id = m.author_id
      WHERE m.case_id = $1 AND ${visibleTo(audience, 'message', 'm')} AND ($2::uuid IS NULL OR m.id = $2::uuid)
      ORDER BY m.created_at, m.id`,
    { bind: [caseId, onlyId ?? null], type: QueryTypes.SELECT },
  )
}
