import { randomUUID } from 'node:crypto'
import { Op } from 'sequelize'
import { db } from '../../db/sequelize'
import { models } from '../../db/models'
import { findUserByEmail } from '../../data/users'
import { hashPassword } from '../../services/auth'
import { analyseRoom, computeAndStoreTriage, triageScore } from '../../services/triage'
import { roomSchema, type Room } from '../../../shared/schemas/room'
import { DEMO_PASSWORD } from '../people'
import { demoRooms } from '../rooms'
import { mulberry32 } from '../../../shared/prng'

/**
 * Twelve weeks of invented history for the supervisor's dashboard: a few hundred cases with the
 * events the desk records (submitted, claimed, replies, questions and answers, plan sent, closed,
 * some reopened) and ratings, written with a handful of multi-row INSERTs. The bench reuses
 * `insertHistory` for its 10 000 cases. Names, rooms and texts are invented.
 */
export async function seed(): Promise<void> {
  await insertHistory({ cases: 360, weeks: 12, listeners: 70, tag: 'history', triageOpen: true })
}

const H = 3_600_000

/** Small deterministic generator (mulberry32), so every demo database gets the same story. */
export const prng = mulberry32

const firstNames = ['Ada', 'Bastian', 'Cleo', 'Dario', 'Elin', 'Farid', 'Greta', 'Hugo', 'Ilse', 'Jaro', 'Kaia', 'Lorcan', 'Mira', 'Nils', 'Orla', 'Pavel', 'Quinn', 'Rosa', 'Soren', 'Tilde', 'Umar', 'Vera', 'Wim', 'Xenia', 'Yusuf', 'Zora']
const lastNames = ['Ambrose', 'Brightwater', 'Castellane', 'Dunmore', 'Eskildsen', 'Ferreira-Holm', 'Galloway', 'Hartigan', 'Iversen', 'Jablonski', 'Kessler', 'Lindqvist-Moe', 'Marchetti', 'Nakagawa', 'Oduya', 'Petrakis', 'Quist', 'Rautio', 'Szabo', 'Thorne']
const roomNames = ['Front room', 'Loft den', 'Garage studio', 'Basement cinema', 'Study', 'Spare bedroom studio', 'Living room', 'Music room', 'Garden office', 'Converted barn']
const titles = [
  'Boomy bass at the sofa', 'Vocals sound smeared', 'Flutter echo when I clap', 'Bass disappears at the desk', 'Stereo image leans left',
  'Subwoofer integration in a long room', 'Harsh treble from bare walls', 'Hollow sound in the centre', 'One note rings on', 'Cinema dialogue is unclear',
  'Mixes do not translate to the car', 'Thin bass at the back row', 'Ceiling reflection above the desk', 'Door rattles on low notes', 'Room sounds dead after treatment',
]
const replies = [
  'Thanks for the clear description. I have looked at the room modes and will suggest seat positions next.',
  'Your front-wall distance puts a notch near 120 Hz; moving the speakers forward should help.',
  'The first reflections off the side walls arrive within the window; panels at the mirror points come first.',
  'Could you measure each speaker on its own from the main seat and upload both files?',
  'The plan is ready: corner bass traps first, then side-wall panels, then re-measure.',
]
const answers = ['Here are the two measurements.', 'I moved the seat back as suggested; it is better.', 'The door cannot move, sadly.', 'Photos of the side walls are attached.']
const comments = ['', '', 'Clear plan and quick answers.', 'The bass traps made a real difference.', 'Took a while, but the advice was good.', 'Would have liked more detail on fixings.', 'Exactly what I needed.', 'Slow first reply.']

export interface HistoryOptions {
  cases: number
  weeks: number
  listeners: number
  /** Prefix of invented listener e-mails, so several runs never collide. */
  tag: string
  /** Compute a triage snapshot for cases still open (the workspace shows it); off for the bench. */
  triageOpen?: boolean
  now?: Date
  seed?: number
}

type Ev = { case_id: string; actor_id: string | null; kind: string; from_status: string | null; to_status: string | null; data: object; created_at: string }

/** Inserts invented listeners, rooms, cases, events, messages and ratings; returns the case ids. */
export async function insertHistory(o: HistoryOptions): Promise<{ caseIds: string[]; listenerIds: string[] }> {
  const rnd = prng(o.seed ?? 7)
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)]
  const logNormal = (medianH: number, spread: number) => medianH * Math.exp(spread * Math.sqrt(-2 * Math.log(rnd() + 1e-12)) * Math.cos(2 * Math.PI * rnd()))
  const now = (o.now ?? new Date()).getTime()
  const start = now - o.weeks * 7 * 24 * H
  const sql = db()

  const created = new Date(start - 14 * 24 * H).toISOString()
  const team = await teamMembers()
  const leftAt = now - 4 * 7 * 24 * H

  // Listeners (who cannot sign in: no password) and one room each, from the demo room shapes.
  // Room variants: the demo shapes with the seat and speakers moved, each analysed by the engine, so
  // the flag breakdown reflects what the engine really finds in such rooms.
  const shapes = Object.values(demoRooms).map((r) => roomSchema.parse(r) as Room)
  const templates: Room[] = []
  const flagSets: { flags: { id: string; severity: string }[]; score: number }[] = []
  for (let v = 0; v < Math.min(o.listeners, 30); v++) {
    const base = shapes[v % shapes.length]
    const seatX = base.length * (0.3 + 0.45 * rnd())
    const spkX = Math.min(0.25 + 1.2 * rnd(), seatX - 1)
    const variant = { ...base, seats: base.seats.map((s, k) => (k === 0 ? { ...s, x: seatX } : s)), speakers: base.speakers.map((s) => ({ ...s, x: spkX })) }
    let room = base
    let flags
    try {
      flags = analyseRoom(variant as Room).flags
      room = variant as Room
    } catch {
      flags = analyseRoom(base).flags
    }
    const ids = flags.map((f) => ({ id: f.id, severity: f.severity }))
    templates.push(room)
    flagSets.push({ flags: ids, score: triageScore(ids, { measurements: 0, photos: 0, descriptionLength: 200 }).score })
  }
  const listeners = Array.from({ length: o.listeners }, (_, i) => ({
    id: randomUUID(),
    email: `${o.tag}-listener-${i + 1}@roomwright.test`,
    name: `${firstNames[i % firstNames.length]} ${lastNames[(i * 7) % lastNames.length]}`,
    template: i % templates.length,
    roomId: randomUUID(),
    roomName: `${pick(roomNames)} of ${firstNames[i % firstNames.length]}`,
  }))
  const { User, Room, RoomRevision, Case } = models()
  const at = new Date(created)
  await User.bulkCreate(listeners.map((l) => ({ id: l.id, email: l.email, name: l.name, role: 'listener' as const, passwordHash: null, createdAt: at, updatedAt: at })))
  await Room.bulkCreate(listeners.map((l) => ({ id: l.roomId, ownerId: l.id, name: l.roomName, createdAt: at, updatedAt: at })))
  await RoomRevision.bulkCreate(listeners.map((l) => ({ roomId: l.roomId, revision: 1, body: { ...templates[l.template], name: l.roomName }, createdBy: l.id, createdAt: at })))

  const cases: Record<string, unknown>[] = []
  const events: Ev[] = []
  const messages: Record<string, unknown>[] = []
  const ratings: Record<string, unknown>[] = []
  const openIds: string[] = []

  for (let i = 0; i < o.cases; i++) {
    // More cases in later weeks (a growing desk), answered faster as the team settles in.
    const u = Math.sqrt(rnd())
    const submitted = Math.round(start + u * (now - start))
    const progress = (submitted - start) / (now - start)
    const l = listeners[Math.floor(rnd() * listeners.length)]
    const id = randomUUID()
    const advisor = pick(team.advisors.filter((a) => a.active || submitted < leftAt - 10 * 24 * H)).id
    const evs: Ev[] = []
    const msgs: Record<string, unknown>[] = []
    const ev = (at: number, actor: string | null, kind: string, from: string | null, to: string | null, data: object = {}) =>
      at <= now && evs.push({ case_id: id, actor_id: actor, kind, from_status: from, to_status: to, data, created_at: new Date(at).toISOString() })
    const msg = (at: number, author: string, body: string) => {
      if (at > now) return
      const mid = randomUUID()
      msgs.push({ id: mid, case_id: id, author_id: author, body, created_at: new Date(at).toISOString() })
      ev(at, author, 'message', null, null, { messageId: mid, internal: false, source: 'app' })
    }
    const createdAt = submitted - (0.2 + rnd() * 20) * H
    ev(createdAt, l.id, 'created', null, 'draft')
    ev(submitted, l.id, 'status', 'draft', 'submitted')

    let status = 'submitted'
    let assignee: string | null = null
    let waitingSince: number | null = submitted
    let firstResponse: number | null = null
    const move = (at: number, actor: string, to: string, kind = 'status') => {
      if (at > now) return false
      ev(at, actor, kind, status, to)
      status = to
      waitingSince = to === 'submitted' || to === 'in_review' ? (waitingSince ?? at) : null
      return true
    }

    const frH = Math.min(logNormal(16 - 9 * progress, 0.75), 160)
    let t = submitted + frH * H
    // A few recent cases nobody has answered yet (some already claimed), so the breach list has work in it.
    const stuck = now - submitted < 60 * H && rnd() < 0.35
    if (stuck && rnd() < 0.5) {
      assignee = advisor
      ev(submitted + rnd() * (now - submitted), advisor, 'claimed', null, null, { assigneeId: advisor })
    }
    if (t <= now && !stuck) {
      assignee = advisor
      ev(t - 0.05 * H, advisor, 'claimed', null, null, { assigneeId: advisor })
      msg(t, advisor, pick(replies))
      move(t, advisor, 'in_review')
      firstResponse = t
      waitingSince = null
      if (rnd() < 0.4) {
        t += (0.5 + rnd() * 6) * H
        msg(t, advisor, replies[3])
        move(t, advisor, 'waiting_on_listener')
        t += logNormal(20, 0.8) * H
        msg(t, l.id, pick(answers))
        if (move(t, l.id, 'in_review')) waitingSince = t
      }
      t += logNormal(30 - 10 * progress, 0.7) * H
      msg(t, advisor, replies[4])
      move(t, advisor, 'plan_sent')
      t += (2 + rnd() * 70) * H
      const closer = rnd() < 0.6 ? l.id : advisor
      if (move(t, closer, 'closed') && rnd() < 0.6) {
        const resolutionH = (t - submitted) / H
        const base = resolutionH < 48 ? 4.6 : resolutionH < 120 ? 4 : 3.2
        const score = Math.max(1, Math.min(5, Math.round(base + (rnd() - 0.5) * 2.2)))
        const at = t + (0.2 + rnd() * 30) * H
        if (at <= now) {
          ratings.push({ case_id: id, listener_id: l.id, score, comment: pick(comments), created_at: new Date(at).toISOString() })
          ev(at, l.id, 'rated', null, null, { score })
        }
      }
      if (status === 'closed' && rnd() < 0.08) {
        t += (12 + rnd() * 96) * H
        if (move(t, l.id, 'submitted', 'reopened')) {
          t += logNormal(6, 0.6) * H
          msg(t, advisor, 'Reopened: let us look at the new measurement together.')
          move(t, advisor, 'in_review')
          t += logNormal(24, 0.6) * H
          move(t, advisor, 'closed')
        }
      }
    }
    if (status !== 'closed') openIds.push(id)
    const fl = flagSets[l.template]
    cases.push({
      id, listener_id: l.id, room_id: l.roomId, title: pick(titles), description: 'Invented demo history case.', status,
      assignee_id: assignee, score: fl.score, flag_ids: fl.flags.map((f) => f.id), flags: fl.flags, reply_token: randomUUID().replace(/-/g, '') + randomUUID().replace(/-/g, '').slice(0, 16),
      submitted_at: new Date(submitted).toISOString(), waiting_since: waitingSince ? new Date(waitingSince).toISOString() : null,
      first_response_at: firstResponse ? new Date(firstResponse).toISOString() : null,
      closed_at: status === 'closed' ? evs.filter((e) => e.to_status === 'closed').at(-1)!.created_at : null,
      last_activity_at: evs.at(-1)!.created_at, created_at: new Date(createdAt).toISOString(),
    })
    events.push(...evs.sort((a, b) => a.created_at.localeCompare(b.created_at)))
    messages.push(...msgs)
  }

  await sql.transaction(async (tx) => {
    const chunked = async (rows: Record<string, unknown>[] | Ev[], q: string) => {
      // raw SQL: set-based bulk load of up to 100 000 rows (jsonb_to_recordset, 2 000 rows a statement), one round trip per chunk
      for (let k = 0; k < rows.length; k += 2000) await sql.query(q, { bind: [JSON.stringify(rows.slice(k, k + 2000))], transaction: tx })
    }
    await chunked(cases, `
      INSERT INTO cases (id, listener_id, room_id, room_revision, title, description, status, assignee_id, score, flag_ids, flags, reply_token,
                         submitted_at, waiting_since, first_response_at, closed_at, last_activity_at, created_at, updated_at)
      SELECT x.id, x.listener_id, x.room_id, 1, x.title, x.description, x.status::case_status, x.assignee_id, x.score,
             ARRAY(SELECT jsonb_array_elements_text(x.flag_ids)), x.flags, x.reply_token,
             x.submitted_at, x.waiting_since, x.first_response_at, x.closed_at, x.last_activity_at, x.created_at, x.last_activity_at
        FROM jsonb_to_recordset($1::jsonb) AS x(id uuid, listener_id uuid, room_id uuid, title text, description text, status text, assignee_id uuid,
             score real, flag_ids jsonb, flags jsonb, reply_token text, submitted_at timestamptz, waiting_since timestamptz,
             first_response_at timestamptz, closed_at timestamptz, last_activity_at timestamptz, created_at timestamptz)`)
    await chunked(messages, `
      INSERT INTO messages (id, case_id, author_id, body, created_at)
      SELECT x.id, x.case_id, x.author_id, x.body, x.created_at FROM jsonb_to_recordset($1::jsonb) AS x(id uuid, case_id uuid, author_id uuid, body text, created_at timestamptz)`)
    await chunked(events, `
      INSERT INTO case_events (case_id, actor_id, kind, from_status, to_status, data, created_at)
      SELECT x.case_id, x.actor_id, x.kind, x.from_status::case_status, x.to_status::case_status, x.data, x.created_at
        FROM jsonb_array_elements($1::jsonb) WITH ORDINALITY AS a(j, n)
       CROSS JOIN LATERAL jsonb_to_record(a.j) AS x(case_id uuid, actor_id uuid, kind text, from_status text, to_status text, data jsonb, created_at timestamptz)
       ORDER BY a.n`)
    await chunked(ratings, `
      INSERT INTO case_ratings (case_id, listener_id, score, comment, created_at)
      SELECT x.case_id, x.listener_id, x.score, x.comment, x.created_at FROM jsonb_to_recordset($1::jsonb) AS x(case_id uuid, listener_id uuid, score smallint, comment text, created_at timestamptz)`)
  })
  const gone = team.advisors.filter((a) => !a.active).map((a) => a.id)
  await User.update({ active: false }, { where: { id: gone }, silent: true })
  await Case.update({ assigneeId: null }, { where: { assigneeId: gone, status: { [Op.ne]: 'closed' } } })
  // Fresh statistics after a bulk load, so the planner does not plan the metrics for empty tables.
  // raw SQL: ANALYZE is maintenance, not a query of the model
  await sql.query('ANALYZE users, rooms, cases, case_events, messages, case_ratings')
  if (o.triageOpen) for (const id of openIds) await computeAndStoreTriage(id)
  return { caseIds: cases.map((c) => c.id as string), listenerIds: listeners.map((l) => l.id) }

  async function teamMembers() {
    const advisors: { id: string; active: boolean }[] = []
    for (const e of ['advisor@roomwright.test', 'priya.halvorsen@roomwright.test', 'supervisor@roomwright.test']) {
      const u = await findUserByEmail(e)
      if (u) advisors.push({ id: u.id, active: true })
    }
    // Two more invented advisors, so the workload table has a spread; Bram left the desk a month ago.
    const hash = await hashPassword(DEMO_PASSWORD)
    for (const [email, name, active] of [
      [`${o.tag}-noor.castellane@roomwright.test`, 'Noor Castellane', true],
      [`${o.tag}-bram.whitlock@roomwright.test`, 'Bram Whitlock', false],
    ] as const) {
      const existing = await findUserByEmail(email)
      const id = existing?.id ?? (await models().User.create({ email, name, role: 'advisor', passwordHash: hash, createdAt: new Date(created) })).id
      advisors.push({ id, active })
    }
    return { advisors }
  }
}
