/**
 * The access matrix: for every API route (keyed `METHOD /api/path` exactly as the Express router
 * declares it) and every socket event, the answer each kind of caller gets. access-matrix.test.ts
 * enumerates the real router and the real socket handlers and fails for any route or event without
 * an entry here, and for any entry whose route no longer exists.
 *
 * Callers (columns, in this order): signed out, the listener who owns the resource, a second
 * listener, an advisor, a supervisor. Adding a route is one line: `'GET /api/x': [at(p), E(401, 200, 404, 200, 200)]`.
 */
import { randomUUID } from 'node:crypto'

export const WHO = ['out', 'owner', 'other', 'advisor', 'supervisor'] as const
export type Who = (typeof WHO)[number]

/** What one world of fixtures holds: all owned by the `owner` listener, except the team's snippet and the advisor's filter. */
export interface World {
  /** a room with a submitted case on it (staff may read it) */
  roomId: string
  /** a room whose only case is a draft (staff may not read it) */
  draftRoomId: string
  /** submitted case */
  caseId: string
  /** draft case */
  draftId: string
  /** a photo on the submitted case (has a thumbnail) */
  photoId: string
  /** a frequency-response text on the submitted case */
  measurementId: string
  /** a photo the advisor attached to an internal note on the submitted case (team only) */
  noteFileId: string
  /** its distinctive file name, which no listener may ever be shown */
  noteFileName: string
  /** a reply snippet of the team (made by the advisor) */
  snippetId: string
  /** the advisor's personal snippet */
  personalSnippetId: string
  /** a saved filter of the advisor */
  filterId: string
  /** the owner's credentials (for login scenarios) */
  owner: { email: string; password: string }
  /** the reply token of the submitted case */
  replyToken: string
}

export interface Scenario {
  note?: string
  path: (w: World) => string
  /** JSON body (for POST/PUT/PATCH), built per caller */
  body?: (w: World, who: Who, me: { email: string; password: string } | null) => unknown
  /** multipart upload instead of a JSON body */
  upload?: 'photo' | 'measurement'
  headers?: (w: World) => Record<string, string>
  /** `world`: each caller gets its own fresh world (the call changes state); `session`: its own fresh session */
  fresh?: 'world' | 'session'
  expect: Record<Who, number>
  /** strings no listener (owner or other) may find anywhere in their answer */
  hiddenFromListeners?: (w: World) => string[]
}

/** Expected statuses in column order: signed out, owner, second listener, advisor, supervisor. */
export const E = (out: number, owner: number, other: number, advisor: number, supervisor: number): Record<Who, number> => ({ out, owner, other, advisor, supervisor })
const all = (s: number) => E(s, s, s, s, s)
const at = (path: (w: World) => string, more: Partial<Scenario> = {}) => ({ path, ...more })
const sc = (base: Omit<Scenario, 'expect'>, expect: Record<Who, number>): Scenario => ({ ...base, expect })

const room = () => ({
  name: 'Matrix room', length: 5.2, width: 3.7, height: 2.4,
  speakers: [{ label: 'L', x: 0.8, y: 1.0, z: 1.0 }, { label: 'R', x: 0.8, y: 2.7, z: 1.0 }],
  seats: [{ label: 'Seat', x: 3.1, y: 1.85, z: 1.1 }],
  surfaces: { front: 'gypsum-on-studs', back: 'gypsum-on-studs', left: 'gypsum-on-studs', right: 'gypsum-on-studs', floor: 'wood-floor-on-joists', ceiling: 'plasterboard-ceiling-on-battens' },
})
const tag = () => randomUUID().slice(0, 8)
/** What would betray the internal note's attachment: its id and its name. */
const noteTraces = (w: World) => [w.noteFileId, w.noteFileName]
const INBOUND_SECRET = process.env.INBOUND_EMAIL_SECRET ?? 'roomwright-development-inbound-secret'

export const routeEntries: Record<string, Scenario[]> = {
  'GET /api/health': [sc(at(() => '/api/health'), all(200))],

  'GET /api/auth/csrf': [sc(at(() => '/api/auth/csrf'), all(200))],
  'POST /api/auth/login': [
    sc(at(() => '/api/auth/login', { fresh: 'session', body: (w, _who, me) => me ?? w.owner }), all(200)),
    sc(at(() => '/api/auth/login', { note: 'wrong password', fresh: 'session', body: (w, _who, me) => ({ email: (me ?? w.owner).email, password: 'not-the-password-42' }) }), all(401)),
  ],
  'POST /api/auth/register': [sc(at(() => '/api/auth/register', { fresh: 'session', body: () => ({ email: `matrix-${tag()}@example.test`, password: 'a-long-enough-password', name: 'New Listener' }) }), all(201))],
  'POST /api/auth/logout': [sc(at(() => '/api/auth/logout', { fresh: 'session' }), all(204))],
  'POST /api/auth/password': [sc(at(() => '/api/auth/password', { note: 'a wrong current password', body: () => ({ currentPassword: 'not-my-password-77', newPassword: 'lantern-orchard-basalt-9' }) }), E(401, 400, 400, 400, 400))],
  'POST /api/auth/password-reset/request': [
    sc(at(() => '/api/auth/password-reset/request', { note: 'an address with no account', body: () => ({ email: `nobody-${tag()}@example.test` }) }), all(202)),
    sc(at(() => '/api/auth/password-reset/request', { note: "the owner's address", body: (w) => ({ email: w.owner.email }) }), all(202)),
  ],
  'POST /api/auth/password-reset': [sc(at(() => '/api/auth/password-reset', { note: 'a link that was never sent', body: () => ({ token: 'Q'.repeat(43), password: 'lantern-orchard-basalt-9' }) }), all(410))],
  'GET /api/auth/me': [sc(at(() => '/api/auth/me'), E(401, 200, 200, 200, 200))],
  'GET /api/auth/session': [sc(at(() => '/api/auth/session'), all(200))],
  'GET /api/auth/preferences': [sc(at(() => '/api/auth/preferences'), E(401, 200, 200, 200, 200))],
  'PATCH /api/auth/preferences': [sc(at(() => '/api/auth/preferences', { body: () => ({ units: 'metric' }) }), E(401, 200, 200, 200, 200))],

  'GET /api/users': [sc(at(() => '/api/users'), E(401, 403, 403, 200, 200))],

  'GET /api/rooms': [sc(at(() => '/api/rooms'), E(401, 200, 200, 403, 403))],
  'POST /api/rooms': [sc(at(() => '/api/rooms', { body: room }), E(401, 201, 201, 403, 403))],
  'POST /api/rooms/preview': [sc(at(() => '/api/rooms/preview', { body: room }), E(401, 200, 200, 200, 200))],
  'POST /api/rooms/subwoofers': [sc(at(() => '/api/rooms/subwoofers', { body: () => ({ room: room(), counts: [1] }) }), E(401, 200, 200, 200, 200))],
  'GET /api/rooms/:id': [
    sc(at((w) => `/api/rooms/${w.roomId}`), E(401, 200, 404, 200, 200)),
    sc(at((w) => `/api/rooms/${w.draftRoomId}`, { note: 'room of a draft only' }), E(401, 200, 404, 404, 404)),
  ],
  'PUT /api/rooms/:id': [sc(at((w) => `/api/rooms/${w.roomId}`, { body: room }), E(401, 200, 404, 403, 403))],

  'GET /api/cases': [sc(at(() => '/api/cases'), E(401, 200, 200, 200, 200))],
  'POST /api/cases': [sc(at(() => '/api/cases', { body: (w) => ({ roomId: w.roomId, title: 'Matrix case' }) }), E(401, 201, 400, 403, 403))],
  'GET /api/cases/:id': [
    sc(at((w) => `/api/cases/${w.caseId}`), E(401, 200, 404, 200, 200)),
    sc(at((w) => `/api/cases/${w.draftId}`, { note: 'a draft' }), E(401, 200, 404, 404, 404)),
  ],
  'PATCH /api/cases/:id': [
    sc(at((w) => `/api/cases/${w.caseId}`, { fresh: 'world', body: (_w, who) => (who === 'advisor' || who === 'supervisor' ? { status: 'in_review', fromStatus: 'submitted' } : { status: 'closed', fromStatus: 'submitted' }) }), E(401, 200, 404, 200, 200)),
    sc(at((w) => `/api/cases/${w.draftId}`, { note: 'edit a draft', fresh: 'world', body: () => ({ title: 'A better title' }) }), E(401, 200, 404, 404, 404)),
  ],
  'GET /api/cases/:id/triage': [
    sc(at((w) => `/api/cases/${w.caseId}/triage`), E(401, 200, 404, 200, 200)),
    sc(at((w) => `/api/cases/${w.draftId}/triage`, { note: 'a draft has none yet' }), E(401, 404, 404, 404, 404)),
  ],
  'GET /api/cases/:id/triage/history': [sc(at((w) => `/api/cases/${w.caseId}/triage/history`), E(401, 200, 404, 200, 200))],
  'GET /api/cases/:id/events': [sc(at((w) => `/api/cases/${w.caseId}/events`, { note: "no trace of the internal note's attachment", hiddenFromListeners: noteTraces }), E(401, 200, 404, 200, 200))],
  'GET /api/cases/:id/messages': [sc(at((w) => `/api/cases/${w.caseId}/messages`, { note: 'no internal note', hiddenFromListeners: noteTraces }), E(401, 200, 404, 200, 200))],
  'POST /api/cases/:id/messages': [
    sc(at((w) => `/api/cases/${w.caseId}/messages`, { body: () => ({ body: 'Matrix message about the 48 Hz mode' }) }), E(401, 201, 404, 201, 201)),
    sc(at((w) => `/api/cases/${w.caseId}/messages`, { note: 'internal note', body: () => ({ body: 'Matrix note', internal: true }) }), E(401, 403, 404, 201, 201)),
    sc(at((w) => `/api/cases/${w.draftId}/messages`, { note: 'on a draft', body: () => ({ body: 'Too early' }) }), E(401, 409, 404, 404, 404)),
  ],
  'GET /api/cases/:id/files': [sc(at((w) => `/api/cases/${w.caseId}/files`, { note: "without the internal note's attachment", hiddenFromListeners: noteTraces }), E(401, 200, 404, 200, 200))],
  'POST /api/cases/:id/files': [
    sc(at((w) => `/api/cases/${w.caseId}/files`, { upload: 'photo' }), E(401, 201, 404, 201, 201)),
    sc(at((w) => `/api/cases/${w.draftId}/files`, { note: 'on a draft', upload: 'measurement' }), E(401, 201, 404, 404, 404)),
  ],

  'GET /api/files/:id': [
    sc(at((w) => `/api/files/${w.photoId}`), E(401, 200, 404, 200, 200)),
    sc(at((w) => `/api/files/${w.measurementId}`, { note: 'a measurement' }), E(401, 200, 404, 200, 200)),
    sc(at((w) => `/api/files/${w.noteFileId}`, { note: 'attachment of an internal note', hiddenFromListeners: noteTraces }), E(401, 404, 404, 200, 200)),
  ],
  'GET /api/files/:id/thumbnail': [
    sc(at((w) => `/api/files/${w.photoId}/thumbnail`), E(401, 200, 404, 200, 200)),
    sc(at((w) => `/api/files/${w.measurementId}/thumbnail`, { note: 'a measurement has none' }), E(401, 404, 404, 404, 404)),
    sc(at((w) => `/api/files/${w.noteFileId}/thumbnail`, { note: 'attachment of an internal note', hiddenFromListeners: noteTraces }), E(401, 404, 404, 200, 200)),
  ],
  'POST /api/files/:id/reanalyse': [
    sc(at((w) => `/api/files/${w.measurementId}/reanalyse`), E(401, 403, 403, 200, 200)),
    sc(at((w) => `/api/files/${w.photoId}/reanalyse`, { note: 'a photo is no measurement' }), E(401, 403, 403, 404, 404)),
  ],

  'GET /api/dev/mailbox': [sc(at(() => '/api/dev/mailbox'), E(401, 403, 403, 403, 200))],
  'POST /api/inbound/email': [
    sc(at(() => '/api/inbound/email', { note: 'without the shared secret', body: (w) => ({ to: `reply+${w.replyToken}@reply.roomwright.test`, from: w.owner.email, text: 'Hello' }) }), all(401)),
    sc(at(() => '/api/inbound/email', { note: 'secret, forged token', headers: () => ({ 'X-Roomwright-Inbound-Secret': INBOUND_SECRET }), body: (w) => ({ to: `reply+forged${tag()}@reply.roomwright.test`, from: w.owner.email, text: 'Hello' }) }), all(403)),
  ],

  'GET /api/snippets': [sc(at(() => '/api/snippets'), E(401, 403, 403, 200, 200))],
  'GET /api/snippets/for-case/:id': [
    sc(at((w) => `/api/snippets/for-case/${w.caseId}`), E(401, 403, 403, 200, 200)),
    sc(at((w) => `/api/snippets/for-case/${w.draftId}`, { note: 'a draft' }), E(401, 403, 403, 404, 404)),
  ],
  'POST /api/snippets': [
    sc(at(() => '/api/snippets', { body: () => ({ title: `Matrix snippet ${tag()}`, body: 'Your first axial mode is {{room.firstAxialHz}}.' }) }), E(401, 403, 403, 201, 201)),
    sc(at(() => '/api/snippets', { note: 'a team snippet', body: () => ({ title: `Matrix team snippet ${tag()}`, body: 'Shared words', scope: 'team' }) }), E(401, 403, 403, 201, 201)),
  ],
  'PUT /api/snippets/:id': [
    sc(at((w) => `/api/snippets/${w.snippetId}`, { note: "the team's snippet (audited)", body: () => ({ title: `Matrix snippet ${tag()}`, body: 'Edited body' }) }), E(401, 403, 403, 200, 200)),
    sc(at((w) => `/api/snippets/${w.personalSnippetId}`, { note: "the advisor's own snippet", body: () => ({ title: `Matrix own snippet ${tag()}`, body: 'Edited body' }) }), E(401, 403, 403, 200, 404)),
    sc(at(() => `/api/snippets/${randomUUID()}`, { note: 'an unknown snippet', body: () => ({ title: `Matrix snippet ${tag()}`, body: 'Edited body' }) }), E(401, 403, 403, 404, 404)),
  ],
  'DELETE /api/snippets/:id': [
    sc(at((w) => `/api/snippets/${w.snippetId}`, { note: "the team's snippet (audited)", fresh: 'world' }), E(401, 403, 403, 204, 204)),
    sc(at((w) => `/api/snippets/${w.personalSnippetId}`, { note: "the advisor's own snippet", fresh: 'world' }), E(401, 403, 403, 204, 404)),
    sc(at(() => `/api/snippets/${randomUUID()}`, { note: 'an unknown snippet' }), E(401, 403, 403, 404, 404)),
  ],

  'GET /api/saved-filters': [sc(at(() => '/api/saved-filters'), E(401, 403, 403, 200, 200))],
  'POST /api/saved-filters': [sc(at(() => '/api/saved-filters', { body: () => ({ name: `Mine ${tag()}`, query: { scope: 'mine' } }) }), E(401, 403, 403, 201, 201))],
  'DELETE /api/saved-filters/:id': [sc(at((w) => `/api/saved-filters/${w.filterId}`, { note: "the advisor's own filter", fresh: 'world' }), E(401, 403, 403, 204, 404))],

  // supervisor dashboard: supervisors only; PUT /targets with an empty body so the shared targets are never changed (the supervisor reaches validation: 400)
  ...Object.fromEntries(['status', 'queue', 'waiting', 'response-times', 'breaches', 'workload', 'reopen-rate', 'flags', 'satisfaction', 'targets'].map((m) => [`GET /api/metrics/${m}`, [sc(at(() => `/api/metrics/${m}`), E(401, 403, 403, 403, 200))]])),
  'PUT /api/metrics/targets': [sc(at(() => '/api/metrics/targets', { note: 'empty body', body: () => ({}) }), E(401, 403, 403, 403, 400))],

  'GET /api/cases/:id/rating': [sc(at((w) => `/api/cases/${w.caseId}/rating`), E(401, 200, 404, 200, 200))],
  'POST /api/cases/:id/rating': [sc(at((w) => `/api/cases/${w.caseId}/rating`, { note: 'the case is not closed yet', body: () => ({ score: 5, comment: 'Great advice' }) }), E(401, 409, 404, 403, 403))],

  'GET /api/cases/:id/plans': [sc(at((w) => `/api/cases/${w.caseId}/plans`), E(401, 200, 404, 200, 200))],
  'POST /api/cases/:id/plans': [sc(at((w) => `/api/cases/${w.caseId}/plans`, { note: 'an empty plan (every field has a default)', body: () => ({}) }), E(401, 403, 403, 201, 201))],
  'GET /api/cases/:id/plans/:version': [sc(at((w) => `/api/cases/${w.caseId}/plans/1`, { note: 'no plan yet', fresh: 'world' }), E(401, 404, 404, 404, 404))],
  'POST /api/cases/:id/plans/:version/send': [sc(at((w) => `/api/cases/${w.caseId}/plans/1/send`, { note: 'no plan yet', fresh: 'world', body: () => ({ fromStatus: 'submitted' }) }), E(401, 403, 403, 404, 404))],
  'GET /api/cases/:id/plans/:version/report.pdf': [sc(at((w) => `/api/cases/${w.caseId}/plans/1/report.pdf`, { note: 'no plan yet', fresh: 'world' }), E(401, 404, 404, 404, 404))],
  'POST /api/plans/preview': [sc(at(() => '/api/plans/preview', { note: 'empty body: staff reach validation', body: () => ({}) }), E(401, 403, 403, 400, 400))],

  'GET /api/team/members': [sc(at(() => '/api/team/members'), E(401, 403, 403, 403, 200))],
  'GET /api/team/listeners': [sc(at(() => '/api/team/listeners?search=matrix'), E(401, 403, 403, 403, 200))],
  'POST /api/team/members/:id/deactivate': [sc(at(() => `/api/team/members/${randomUUID()}/deactivate`, { note: 'an unknown member' }), E(401, 403, 403, 403, 404))],
  'POST /api/team/members/:id/reactivate': [sc(at(() => `/api/team/members/${randomUUID()}/reactivate`, { note: 'an unknown member' }), E(401, 403, 403, 403, 404))],
  'PUT /api/team/members/:id/role': [sc(at(() => `/api/team/members/${randomUUID()}/role`, { note: 'an unknown member', body: () => ({ role: 'advisor' }) }), E(401, 403, 403, 403, 404))],
  'GET /api/team/invitations': [sc(at(() => '/api/team/invitations'), E(401, 403, 403, 403, 200))],
  'POST /api/team/invitations': [sc(at(() => '/api/team/invitations', { body: () => ({ email: `invitee-${tag()}@example.test`, name: 'Invited Advisor', role: 'advisor' }) }), E(401, 403, 403, 403, 201))],
  'DELETE /api/team/invitations/:id': [sc(at(() => `/api/team/invitations/${randomUUID()}`, { note: 'an unknown invitation' }), E(401, 403, 403, 403, 404))],
  'GET /api/team/invitations/by-token/:token': [sc(at(() => `/api/team/invitations/by-token/${'A'.repeat(43)}`, { note: 'a made-up token (public route)' }), all(404))],
  'POST /api/team/invitations/accept': [sc(at(() => '/api/team/invitations/accept', { note: 'a made-up token (public route)', body: () => ({ token: 'B'.repeat(43), password: 'a-long-enough-password' }) }), all(404))],
  'GET /api/audit': [sc(at(() => '/api/audit'), E(401, 403, 403, 403, 200))],
}

/**
 * Socket events. `ack`: the acknowledgement's `ok` or error code; `typing`: whether another member of
 * the case room sees the presence; `leave`: after leaving, no further case events arrive (`stops`).
 * A signed-out socket never connects (`signed_out`).
 */
export interface SocketScenario {
  note?: string
  kind: 'ack' | 'typing' | 'leave'
  payload: (w: World) => unknown
  expect: Record<Who, string>
  /** strings no listener's acknowledgement may contain */
  hiddenFromListeners?: (w: World) => string[]
}
const S = (out: string, owner: string, other: string, advisor: string, supervisor: string): Record<Who, string> => ({ out, owner, other, advisor, supervisor })

export const socketEntries: Record<string, SocketScenario[]> = {
  'case.join': [
    { kind: 'ack', payload: (w) => ({ caseId: w.caseId }), expect: S('signed_out', 'ok', 'not_found', 'ok', 'ok') },
    { note: "catching up from the start: no trace of the internal note's attachment", kind: 'ack', payload: (w) => ({ caseId: w.caseId, afterSeq: 0 }), expect: S('signed_out', 'ok', 'not_found', 'ok', 'ok'), hiddenFromListeners: noteTraces },
    { note: 'a draft', kind: 'ack', payload: (w) => ({ caseId: w.draftId }), expect: S('signed_out', 'ok', 'not_found', 'not_found', 'not_found') },
    { note: 'no caseId', kind: 'ack', payload: () => ({}), expect: S('signed_out', 'invalid', 'invalid', 'invalid', 'invalid') },
  ],
  'queue.join': [{ kind: 'ack', payload: () => ({}), expect: S('signed_out', 'forbidden', 'forbidden', 'ok', 'ok') }],
  'case.typing': [{ kind: 'typing', payload: (w) => ({ caseId: w.caseId, typing: true }), expect: S('signed_out', 'seen', 'unseen', 'seen', 'seen') }],
  'case.leave': [{ kind: 'leave', payload: (w) => ({ caseId: w.caseId }), expect: S('signed_out', 'stops', 'stops', 'stops', 'stops') }],
}
