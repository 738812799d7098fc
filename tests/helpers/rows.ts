/**
 * Writing rows straight into the database for a test's set-up, through the models (the data layer
 * the server uses), for states the API cannot reach quickly: an expired link, a stale outbox row,
 * a wait that began hours ago, a history with fixed timestamps.
 */
export { models } from '../../server/db/models'

/** `hours` before now (the test process's clock; the database runs on the same machine). */
export const hoursAgo = (hours: number) => new Date(Date.now() - hours * 3_600_000)
export const minutesAgo = (minutes: number) => hoursAgo(minutes / 60)
