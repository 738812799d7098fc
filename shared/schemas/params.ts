import { z } from 'zod'

/**
 * Path and query parameters, one schema per shape, used by every router (server/routes/*) so a
 * malformed id or a number past what the database holds answers 400 with the field path, never 500.
 */
export const idSchema = z.string().uuid('must be an id')
/** `/:id` of a case, room, file, snippet, filter, member or invitation. */
export const idParamsSchema = z.object({ id: idSchema })
/** `?revision=` of a room: a positive whole number within PostgreSQL's integer column. */
export const revisionQuerySchema = z.object({ revision: z.coerce.number().int().min(1).max(2_147_483_647).optional() })
/** `?after=` of a case's history: a sequence number (bigint column), within what JavaScript counts exactly. */
export const afterQuerySchema = z.object({ after: z.coerce.number().int().min(0).max(Number.MAX_SAFE_INTEGER).optional() })
/** `/cases/:id/plans/:version` */
export const casePlanParamsSchema = z.object({ id: idSchema, version: z.coerce.number().int().min(1).max(100_000) })
