import { Op } from 'sequelize'
import { db } from '../../db/sequelize'
import { models } from '../../db/models'
import { analyseRoom, computeAndStoreTriage, triageScore } from '../../services/triage'
import { predictPlan } from '../../../shared/plan'
import { ENGINE_VERSION } from '../../../shared/acoustics'
import { roomSchema, type Room } from '../../../shared/schemas/room'
import type { PlanBody } from '../../../shared/schemas/plan'
import type { PlanPredictions } from '../../../shared/plan'
import { demoRooms } from '../rooms'
import { demoStories, type DemoStory } from '../stories'
import { demoPlanBody } from '../demo-plan'
import { prng } from './0003-history'

/** Texts step 0003 wrote, recognised here so they can be replaced by each story's own words. */
const oldAsk = 'Could you measure each speaker on its own from the main seat and upload both files?'
const oldPlan = 'The plan is ready: corner bass traps first, then side-wall panels, then re-measure.'
const oldReopened = 'Reopened: let us look at the new measurement together.'
const H = 3_600_000
const VARIANTS_PER_STORY = 2

interface Template { story: DemoStory; room: Room; flags: { id: string; severity: string }[]; plan?: { body: PlanBody; predictions: PlanPredictions } }

/**
 * Gives the invented history variety and makes every case consistent with its status:
 *   - each history room becomes one of the stories' rooms (small studio, living room with the sofa
 *     against the back wall, dedicated cinema with a subwoofer, attic under a sloped roof, …), slightly
 *     varied, with its engine flags and score, and each case's title, description and messages are
 *     that story's words (no message claims files the case does not have);
 *   - every case that reached "plan sent" (and so every closed one) holds the plan version that was sent;
 *   - every closed case carries the listener's rating;
 *   - open cases get a fresh triage of their new room.
 * Works on a fresh demo database and on one seeded by the earlier steps alike; cases people changed
 * (their description is no longer the seeded one) are left as they are.
 */
export async function seed(): Promise<void> {
  const sql = db()
  const rnd = prng(16)
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)]
  const now = Date.now()

  const templates: Template[] = []
  for (const story of demoStories) {
    const base = roomSchema.parse(demoRooms[story.shape])
    for (let v = 0; v < VARIANTS_PER_STORY; v++) templates.push(variant(story, base, v === 0 ? 0 : 1, rnd))
  }

  const { Room, Case, Message, CaseEvent } = models()
  const owned = await Room.findAll({
    attributes: ['id', 'ownerId', 'name'], where: { currentRevision: 1 },
    include: [{ association: 'owner', attributes: ['email'], where: { email: { [Op.like]: 'history-listener-%' } }, required: true }],
  })
  const emailOf = (r: (typeof owned)[number]) => r.owner!.email
  const rooms = owned.sort((a, b) => emailOf(a).length - emailOf(b).length || (emailOf(a) < emailOf(b) ? -1 : emailOf(a) > emailOf(b) ? 1 : 0))
  const roomTemplate = new Map<string, Template>()
  const roomRows: { id: string; name: string; body: Room }[] = []
  rooms.forEach((r, i) => {
    const tpl = templates[(i * VARIANTS_PER_STORY + Math.floor(i / demoStories.length)) % templates.length]
    const firstName = r.name.split(' of ').at(-1) ?? ''
    const name = `${pick(tpl.story.roomNames)}${firstName ? ` of ${firstName}` : ''}`
    roomTemplate.set(r.id, tpl)
    roomRows.push({ id: r.id, name, body: { ...tpl.room, name } })
  })

  const cases = (await Case.findAll({
    attributes: ['id', 'roomId', 'listenerId', 'assigneeId', 'status', 'submittedAt', 'closedAt', 'createdAt'],
    where: { roomId: rooms.map((r) => r.id), description: 'Invented demo history case.' },
    include: [{ association: 'rating', attributes: ['caseId'], required: false }, { association: 'plans', attributes: ['id'], required: false }],
    order: [['createdAt', 'ASC']],
  })).map((c) => ({
    id: c.id, room_id: c.roomId, listener_id: c.listenerId, assignee_id: c.assigneeId, status: c.status,
    submitted_at: c.submittedAt!, closed_at: c.closedAt, rated: !!c.rating, has_plan: !!c.plans?.length,
  }))
  const ids = cases.map((c) => c.id)
  const messages = (await Message.findAll({
    attributes: ['id', 'caseId', 'body', 'createdAt'], where: { caseId: ids },
    include: [{ association: 'author', attributes: ['role'], required: true }],
    order: [['caseId', 'ASC'], ['createdAt', 'ASC'], ['id', 'ASC']],
  })).map((m) => ({ id: m.id, case_id: m.caseId, body: m.body, staff: m.author!.role !== 'listener' }))
  // the latest move to plan_sent of each case (the first row per case, newest first)
  const planSent = (await CaseEvent.findAll({
    attributes: ['id', 'caseId', 'actorId', 'createdAt'], where: { caseId: ids, kind: 'status', toStatus: 'plan_sent' },
    order: [['caseId', 'ASC'], ['createdAt', 'DESC']],
  })).map((e) => ({ id: e.id, case_id: e.caseId, actor_id: e.actorId, created_at: e.createdAt }))
  const planEvent = new Map<string, (typeof planSent)[number]>()
  for (const e of planSent) if (!planEvent.has(e.case_id)) planEvent.set(e.case_id, e)
  const byCase = new Map<string, typeof messages>()
  for (const m of messages) byCase.set(m.case_id, [...(byCase.get(m.case_id) ?? []), m])

  const caseRows: object[] = []
  const messageRows: { id: string; body: string }[] = []
  const planRows: object[] = []
  const ratingRows: object[] = []
  const eventRows: object[] = []
  const planEventIds: string[] = []
  for (const c of cases) {
    const tpl = roomTemplate.get(c.room_id)!
    const s = tpl.story
    const description = pick(s.descriptions)
    const { score } = triageScore(tpl.flags, { measurements: 0, photos: 0, descriptionLength: description.length })
    caseRows.push({ id: c.id, title: pick(s.titles), description, answers: s.answers, flags: tpl.flags, flag_ids: tpl.flags.map((f) => f.id), score })

    const ask = pick(s.asks)
    let answered = false
    ;(byCase.get(c.id) ?? []).forEach((m, k) => {
      let body: string
      if (m.staff) {
        if (k === 0) body = pick(s.firstReplies)
        else if (m.body === oldAsk) body = ask.ask
        else if (m.body === oldPlan) body = pick(s.planMessages)
        else if (m.body === oldReopened) body = 'Reopened: tell me what changed since the plan, and we will go through it together.'
        else body = pick(s.firstReplies)
      } else {
        body = answered ? 'Thank you, I will try that and report back.' : ask.answer
        answered = true
      }
      messageRows.push({ id: m.id, body })
    })

    const sent = planEvent.get(c.id)
    if (sent && !c.has_plan) {
      tpl.plan ??= (() => {
        const body = demoPlanBody(tpl.room, s.planNotes)
        return { body, predictions: predictPlan(tpl.room, body) } // offline seed: in this thread
      })()
      const at = new Date(sent.created_at).getTime()
      const by = sent.actor_id ?? c.assignee_id
      planRows.push({
        case_id: c.id, room_id: c.room_id, body: tpl.plan.body, predictions: tpl.plan.predictions, created_by: by, sent_by: by,
        created_at: new Date(at - 25 * 60_000).toISOString(), sent_at: new Date(at).toISOString(),
      })
      eventRows.push({ case_id: c.id, actor_id: by, kind: 'plan-sent', data: { version: 1 }, created_at: new Date(at).toISOString() })
      planEventIds.push(sent.id)
    }
    if (c.status === 'closed' && !c.rated && c.closed_at) {
      const resolutionH = (new Date(c.closed_at).getTime() - new Date(c.submitted_at).getTime()) / H
      const base = resolutionH < 48 ? 4.6 : resolutionH < 120 ? 4 : 3.2
      const value = Math.max(1, Math.min(5, Math.round(base + (rnd() - 0.5) * 2.2)))
      const at = Math.min(new Date(c.closed_at).getTime() + (0.2 + rnd() * 20) * H, now - 60_000)
      ratingRows.push({ case_id: c.id, listener_id: c.listener_id, score: value, comment: rnd() < 0.25 ? '' : pick(value >= 4 ? s.good : s.mixed), created_at: new Date(at).toISOString() })
      eventRows.push({ case_id: c.id, actor_id: c.listener_id, kind: 'rated', data: { score: value }, created_at: new Date(at).toISOString() })
    }
  }

  await sql.transaction(async (transaction) => {
    // raw SQL: set-based updates and inserts over every history row at once (jsonb_to_recordset), one statement per table
    const run = (q: string, rows: object[]) => (rows.length ? sql.query(q, { bind: [JSON.stringify(rows)], transaction }) : Promise.resolve())
    await run(`UPDATE rooms r SET name = x.name FROM jsonb_to_recordset($1::jsonb) AS x(id uuid, name text) WHERE r.id = x.id`, roomRows)
    await run(`UPDATE room_revisions v SET body = x.body FROM jsonb_to_recordset($1::jsonb) AS x(id uuid, body jsonb) WHERE v.room_id = x.id AND v.revision = 1`, roomRows)
    await run(`
      UPDATE cases c SET title = x.title, description = x.description, answers = x.answers, flags = x.flags,
             flag_ids = ARRAY(SELECT jsonb_array_elements_text(x.flag_ids)), score = x.score
        FROM jsonb_to_recordset($1::jsonb) AS x(id uuid, title text, description text, answers jsonb, flags jsonb, flag_ids jsonb, score real)
       WHERE c.id = x.id`, caseRows)
    await run(`UPDATE messages m SET body = x.body FROM jsonb_to_recordset($1::jsonb) AS x(id uuid, body text) WHERE m.id = x.id`, messageRows)
    await run(`
      INSERT INTO treatment_plans (case_id, version, room_id, room_revision, body, predictions, engine_version, created_by, created_at, sent_at, sent_by)
      SELECT x.case_id, 1, x.room_id, 1, x.body, x.predictions, '${ENGINE_VERSION}', x.created_by, x.created_at, x.sent_at, x.sent_by
        FROM jsonb_to_recordset($1::jsonb) AS x(case_id uuid, room_id uuid, body jsonb, predictions jsonb, created_by uuid, created_at timestamptz, sent_at timestamptz, sent_by uuid)`, planRows)
    await run(`
      INSERT INTO case_ratings (case_id, listener_id, score, comment, created_at)
      SELECT x.case_id, x.listener_id, x.score, x.comment, x.created_at FROM jsonb_to_recordset($1::jsonb) AS x(case_id uuid, listener_id uuid, score smallint, comment text, created_at timestamptz)`, ratingRows)
    await run(`
      INSERT INTO case_events (case_id, actor_id, kind, data, created_at)
      SELECT x.case_id, x.actor_id, x.kind, x.data, x.created_at FROM jsonb_to_recordset($1::jsonb) AS x(case_id uuid, actor_id uuid, kind text, data jsonb, created_at timestamptz)
       ORDER BY x.created_at`, eventRows)
    if (planEventIds.length) {
      // raw SQL: merging a key into a jsonb column (||) has no ORM form
      await sql.query(`UPDATE case_events SET data = data || '{"planVersion": 1}'::jsonb WHERE id = ANY($1::bigint[])`, { bind: [planEventIds], transaction })
    }
  })
  for (const c of cases) if (c.status !== 'closed') await computeAndStoreTriage(c.id)
  // raw SQL: ANALYZE is maintenance, not a query of the model
  await sql.query('ANALYZE rooms, room_revisions, cases, messages, case_events, case_ratings, treatment_plans')
}

/** A story's room with its size and positions moved a little (variant 0 is the room as written). */
function variant(story: DemoStory, base: Room, amount: number, rnd: () => number): Template {
  const jitter = (v: number, by: number) => v + (rnd() - 0.5) * 2 * by * amount
  const r2 = (v: number) => Math.round(v * 100) / 100
  const length = r2(jitter(base.length, base.length * 0.04))
  const width = r2(jitter(base.width, base.width * 0.04))
  const sx = length / base.length
  const sy = width / base.width
  const inside = <P extends { x: number; y: number; z: number }>(p: P, by: number): P => ({
    ...p, x: r2(Math.min(length - 0.1, Math.max(0.1, jitter(p.x * sx, by)))), y: r2(Math.min(width - 0.1, Math.max(0.1, p.y * sy))),
  })
  const candidate = {
    ...base, length, width,
    speakers: base.speakers.map((s) => inside(s, story.wiggle)),
    subwoofers: base.subwoofers.map((s) => inside(s, 0)),
    seats: base.seats.map((s) => inside(s, story.wiggle)),
    openings: base.openings.map((o) => {
      const span = o.wall === 'left' || o.wall === 'right' ? length : width
      const scale = span / (o.wall === 'left' || o.wall === 'right' ? base.length : base.width)
      return { ...o, from: r2(o.from * scale), to: r2(Math.min(span, o.to * scale)) }
    }),
    treatments: base.treatments.map((t) => ({ ...t, x: r2(Math.min(length, t.x * sx)), y: r2(Math.min(width, t.y * sy)) })),
  }
  const parsed = roomSchema.safeParse(candidate)
  const room = parsed.success ? (parsed.data as Room) : base
  try {
    return { story, room, flags: analyseRoom(room).flags.map((f) => ({ id: f.id, severity: f.severity })) }
  } catch {
    return { story, room: base, flags: analyseRoom(base).flags.map((f) => ({ id: f.id, severity: f.severity })) }
  }
}
