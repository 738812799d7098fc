import { QueryTypes, type Transaction } from 'sequelize'
import { models } from '../db/models'
import { findCase, setScore } from '../data/cases'
import { countEvidence } from '../data/files'
import { findRoom } from '../data/rooms'
import { findUserById } from '../data/users'
import { insertEvent } from '../data/events'
import { computeRoomAnalysis, ENGINE_VERSION, type RoomAnalysis } from '../../shared/acoustics'
import { flattenReflections, type TriageHistoryEntry, type TriageSnapshot } from '../../shared/schemas/triage'
import { engineLimitIssues, type Room } from '../../shared/schemas/room'
import { AppError, conflict, notFound } from '../errors'
import { EngineTaskFailedError, runEngineTask } from '../analysis/pool'

export type { TriageSnapshot }

/**
 * The stored part of a case's queue priority (the queue adds the time the listener has waited, so
 * that figure stays current without recomputing):
 *   each 'problem' flag 10 points, each 'warning' 4, each 'info' 1 (capped at 40 in all);
 *   missing information: no measurement file +6, no photo +3, a description under 80 characters +3.
 * Queue priority = score + min(hours waiting for us, 96) / 4, so four days of waiting outweighs
 * about two and a half problems. Weights are ours (no published source): severity first, then waiting.
 */
export function triageScore(flags: { severity: string }[], info: { measurements: number; photos: number; descriptionLength: number }) {
  const sev = flags.reduce((s, f) => s + (f.severity === 'problem' ? 10 : f.severity === 'warning' ? 4 : 1), 0)
  const parts = [{ label: 'setup flags', points: Math.min(40, sev) }]
  if (info.measurements === 0) parts.push({ label: 'no measurement yet', points: 6 })
  if (info.photos === 0) parts.push({ label: 'no photo yet', points: 3 })
  if (info.descriptionLength < 80) parts.push({ label: 'short description', points: 3 })
  return { score: parts.reduce((s, p) => s + p.points, 0), parts }
}

/** In this thread: for the seed and tests only (requests use analyseRoomOffThread). `units`: lengths in the setup-flag messages. */
export function analyseRoom(room: Room, units: 'metric' | 'imperial' = 'metric') {
  return computeRoomAnalysis(room, { units })
}

/** 422 naming the limit when the room is beyond what the engine accepts (ROOM_LIMITS in shared/schemas/room.ts). */
export function assertWithinEngineLimits(room: Room): void {
  const issues = engineLimitIssues(room)
  if (issues.length) {
    throw new AppError(`This room is beyond what Roomwright analyses: ${issues[0].message}`, {
      status: 422, code: 'beyond_engine_limits', fields: issues.map((i) => ({ path: i.path, message: i.message })),
    })
  }
}

/**
 * The complete analysis in the worker pool, never on the event loop (a large room takes the engine
 * far longer than a request may hold the loop). Checks the limits first; the engine's RangeError for an
 * impossible room answers 422 with its physical reason; a crashed or overrun worker 503.
 */
export async function analyseRoomOffThread(room: Room, units: 'metric' | 'imperial' = 'metric'): Promise<RoomAnalysis> {
  return offThread(room, () => runEngineTask('roomAnalysis', room, { units }))
}

/** The analysis as JSON text, serialised in the worker (for answering it as it is). */
export async function analyseRoomOffThreadJson(room: Room, units: 'metric' | 'imperial' = 'metric'): Promise<string> {
  return offThread(room, () => runEngineTask('roomAnalysisJson', room, { units }))
}

async function offThread<T>(room: Room, run: () => Promise<T>): Promise<T> {
  assertWithinEngineLimits(room)
  try {
    return await run()
  } catch (e) {
    if (e instanceof RangeError) throw new AppError(`The engine cannot analyse this room: ${e.message}`, { status: 422, code: 'engine_refused' })
    if (e instanceof EngineTaskFailedError) throw new AppError('The room engine is busy; please try again in a moment', { status: 503, code: 'engine_unavailable' })
    throw e
  }
}

/** The snapshot for one room revision: pure, so it is golden-tested without a database. */
export function buildTriageSnapshot(room: Room, roomRevision: number, info: { measurements: number; photos: number; descriptionLength: number }, computedAt: Date, units: 'metric' | 'imperial' = 'metric'): TriageSnapshot {
  return snapshotFromAnalysis(analyseRoom(room, units), roomRevision, info, computedAt)
}

/** The snapshot from an analysis already made (in the worker): cheap, fit for inside a transaction. */
export function snapshotFromAnalysis(a: RoomAnalysis, roomRevision: number, info: { measurements: number; photos: number; descriptionLength: number }, computedAt: Date): TriageSnapshot {
  const { score, parts } = triageScore(a.flags, info)
  return {
    engineVersion: ENGINE_VERSION,
    roomRevision,
    room: a.room,
    modes: a.modes,
    modeAnalysis: a.modeAnalysis,
    reflections: flattenReflections(a.reflections),
    reflectionWindow: a.reflectionWindow,
    reflectionPairs: a.reflections,
    notches: a.notches,
    reverberation: a.reverberation,
    flags: a.flags,
    seat: a.seat,
    score,
    scoreParts: parts,
    computedAt: computedAt.toISOString(),
  }
}

/** An analysis made before a transaction, for one room revision. */
export interface PreparedAnalysis { roomId: string; revision: number | null; analysis: RoomAnalysis }

/**
 * Analyses a room revision in the worker, before any transaction opens (the write that follows stays short).
 * `revision` null: the analysis is of room content about to be saved as a new revision.
 */
export async function prepareTriage(roomId: string, revision?: number): Promise<PreparedAnalysis> {
  const room = await findRoom(roomId, revision)
  if (!room) throw notFound('That room')
  // setup-flag messages in the listener's units (the listener reads them on the case page)
  const units = (await findUserById(room.ownerId))?.units ?? 'metric'
  return { roomId, revision: room.revision, analysis: await analyseRoomOffThread(room.room, units) }
}

/**
 * Computes the triage for the case's room revision with the engine (in the worker) and stores it:
 * outside any transaction (the seed, jobs). Inside a transaction use storeTriage with a prepared analysis.
 */
export async function computeAndStoreTriage(caseId: string): Promise<TriageSnapshot> {
  const c = await findCase(caseId)
  if (!c) throw notFound('That case')
  const prepared = await prepareTriage(c.room.id, c.room.revision)
  return storeTriage(caseId, prepared)
}

/**
 * Stores the triage of a case from an analysis made beforehand (no engine work here: this runs inside
 * the caller's transaction). The case must still be on the analysed room revision, or 409 stale.
 */
export async function storeTriage(caseId: string, prepared: PreparedAnalysis, t?: Transaction): Promise<TriageSnapshot> {
  const c = await findCase(caseId, t)
  if (!c) throw notFound('That case')
  if (c.room.id !== prepared.roomId || (prepared.revision !== null && c.room.revision !== prepared.revision)) {
    throw conflict('The room changed while the case was being sent; reload and try again', 'stale')
  }
  const room = await findRoom(c.room.id, c.room.revision, t)
  if (!room) throw notFound('That room')
  const counts = await countEvidence(caseId, t)
  const snapshot = snapshotFromAnalysis(prepared.analysis, room.revision, { ...counts, descriptionLength: c.description.length }, new Date())
  const score = snapshot.score
  await models().TriageSnapshot.create({ caseId, roomRevision: room.revision, engineVersion: ENGINE_VERSION, body: snapshot, score }, { transaction: t })
  await setScore(caseId, score, snapshot.flags.map((f) => ({ id: f.id, severity: f.severity })), t)
  await insertEvent({ caseId, actorId: null, kind: 'triage', data: { roomRevision: room.revision, engineVersion: ENGINE_VERSION, score } }, t)
  return snapshot
}

/**
 * Re-weighs the stored score after the case's information changed (a photo or measurement arrived),
 * from the latest snapshot's flags; the snapshot itself stays as computed.
 */
export async function refreshScore(caseId: string, t?: Transaction): Promise<void> {
  const now = await currentTriage(caseId, t)
  if (!now) return
  await setScore(caseId, now.score, undefined, t)
}

/** The case's latest snapshot and its score re-weighed with the files and description the case has now. */
async function currentTriage(caseId: string, t?: Transaction) {
  const { Case, TriageSnapshot } = models()
  const [snap, c, counts] = await Promise.all([
    TriageSnapshot.findOne({ where: { caseId }, order: [['id', 'DESC']], transaction: t }),
    Case.findByPk(caseId, { attributes: ['id', 'description'], transaction: t }),
    countEvidence(caseId, t),
  ])
  if (!snap || !c) return null
  return { body: snap.body, ...triageScore(snap.body.flags, { ...counts, descriptionLength: c.description.length }) }
}

/** The latest snapshot, with its score re-weighed for what the case holds now (files arrive after submission). */
export async function latestTriage(caseId: string): Promise<TriageSnapshot | null> {
  const now = await currentTriage(caseId)
  return now ? { ...now.body, score: now.score, scoreParts: now.parts } : null
}

/** Every triage of a case, oldest first, reduced to the figures compared between room revisions (computed in SQL). */
export async function triageHistory(caseId: string): Promise<TriageHistoryEntry[]> {
  // raw SQL: the figures are picked out of each snapshot's JSON body in the database (jsonb_array_elements), not shipped whole
  const rows = await models().TriageSnapshot.sequelize!.query<{ room_revision: number; computed_at: Date; engine_version: string; score: number; flags: { id: string; severity: string }[] | null; rt500: number | null; spread: number | null; in_window: number }>(
    `SELECT ts.room_revision, ts.computed_at, ts.engine_version, ts.score,
            (SELECT jsonb_agg(jsonb_build_object('id', f->>'id', 'severity', f->>'severity')) FROM jsonb_array_elements(ts.body->'flags') f) AS flags,
            (SELECT (b->>'eyring')::float FROM jsonb_array_elements(ts.body->'reverberation'->'bands') b WHERE (b->>'hz')::int = 500) AS rt500,
            (ts.body->'seat'->'modalResponse'->>'spreadDb')::float AS spread,
            (SELECT count(*)::int FROM jsonb_array_elements(ts.body->'reflections') r WHERE (r->>'inWindow')::boolean) AS in_window
       FROM triage_snapshots ts WHERE ts.case_id = $1 ORDER BY ts.id`,
    { bind: [caseId], type: QueryTypes.SELECT },
  )
  return rows.map((r) => ({
    roomRevision: r.room_revision, computedAt: new Date(r.computed_at).toISOString(), engineVersion: r.engine_version, score: r.score,
    flags: r.flags ?? [], rt500: r.rt500, seatSpreadDb: r.spread, reflectionsInWindow: r.in_window,
  }))
}
