import { QueryTypes } from 'sequelize'
import { db } from '../db/sequelize'
import { insertEvent } from '../data/events'
import { withTransaction } from '../db/transaction'
import { conflict, forbidden, notFound } from '../errors'
import { ratingSchema, type Rating, type RatingInput } from '../../shared/schemas/metrics'
import type { User } from '../../shared/schemas/auth'
import { isStaff, readableCase } from './access'
import { publishCase } from './live'

interface RatingRow { case_id: string; score: number; comment: string; created_at: Date }
const toRating = (r: RatingRow): Rating => ({ caseId: r.case_id, score: r.score, comment: r.comment, createdAt: new Date(r.created_at).toISOString() })

/** The listener rates a closed case once (1–5 and a comment); the rating also goes into the case's history. */
export async function rateCase(user: User, caseId: string, input: RatingInput): Promise<Rating> {
  const body = ratingSchema.parse(input)
  if (user.role !== 'listener') throw forbidden('Only the listener who opened the case rates it')
  const c = await readableCase(user, caseId)
  if (c.listenerId !== user.id) throw notFound('That case')
  if (c.status !== 'closed') throw conflict('A case can be rated once it is closed', 'not_closed')
  return withTransaction(async (t, afterCommit) => {
    const rows = await db().query<RatingRow>(
      `INSERT INTO case_ratings (case_id, listener_id, score, comment) VALUES ($1, $2, $3, $4)
       ON CONFLICT (case_id) DO NOTHING RETURNING case_id, score, comment, created_at`,
      { bind: [caseId, user.id, body.score, body.comment], type: QueryTypes.SELECT, transaction: t },
    )
    if (!rows.length) throw conflict('You have already rated this case; thank you', 'already_rated')
    const seq = await insertEvent({ caseId, actorId: user.id, kind: 'rated', data: { score: body.score } }, t)
    afterCommit(() => publishCase(caseId, { type: 'case.event', caseId, seq, kind: 'rated' }))
    return toRating(rows[0])
  })
}

/** The case's rating, for its listener and the team; null when there is none yet. */
export async function getRating(user: User, caseId: string): Promise<Rating | null> {
  const c = await readableCase(user, caseId)
  if (c.listenerId !== user.id && !isStaff(user)) throw notFound('That case')
  const rows = await db().query<RatingRow>('SELECT case_id, score, comment, created_at FROM case_ratings WHERE case_id = $1', {
    bind: [caseId], type: QueryTypes.SELECT,
  })
  return rows[0] ? toRating(rows[0]) : null
}
