import { models, type CaseRatingModel } from '../db/models'
import { insertEvent } from '../data/events'
import { withTransaction } from '../db/transaction'
import { conflict, forbidden, notFound } from '../errors'
import { ratingSchema, type Rating, type RatingInput } from '../../shared/schemas/metrics'
import type { User } from '../../shared/schemas/auth'
import { isStaff, readableCase } from './access'
import { publishCase } from './live'

const toRating = (r: CaseRatingModel): Rating => ({ caseId: r.caseId, score: r.score, comment: r.comment, createdAt: r.createdAt.toISOString() })

/** The listener rates a closed case once (1–5 and a comment); the rating also goes into the case's history. */
export async function rateCase(user: User, caseId: string, input: RatingInput): Promise<Rating> {
  const body = ratingSchema.parse(input)
  if (user.role !== 'listener') throw forbidden('Only the listener who opened the case rates it')
  const c = await readableCase(user, caseId)
  if (c.listenerId !== user.id) throw notFound('That case')
  if (c.status !== 'closed') throw conflict('A case can be rated once it is closed', 'not_closed')
  return withTransaction(async (t, afterCommit) => {
    // ON CONFLICT DO NOTHING: a second rating (or a race of two) leaves the first one and answers 409.
    const [rating, created] = await models().CaseRating.findOrCreate({
      where: { caseId }, defaults: { caseId, listenerId: user.id, score: body.score, comment: body.comment }, transaction: t,
    })
    if (!created) throw conflict('You have already rated this case; thank you', 'already_rated')
    const seq = await insertEvent({ caseId, actorId: user.id, kind: 'rated', data: { score: body.score } }, t)
    afterCommit(() => publishCase(caseId, { type: 'case.event', caseId, seq, kind: 'rated' }))
    return toRating(rating)
  })
}

/** The case's rating, for its listener and the team; null when there is none yet. */
export async function getRating(user: User, caseId: string): Promise<Rating | null> {
  const c = await readableCase(user, caseId)
  if (c.listenerId !== user.id && !isStaff(user)) throw notFound('That case')
  const r = await models().CaseRating.findByPk(caseId)
  return r ? toRating(r) : null
}
