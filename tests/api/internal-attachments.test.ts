import { beforeAll, describe, expect, it } from 'vitest'
import { randomUUID } from 'node:crypto'
import type { Socket } from 'socket.io-client'
import { insertEvent } from '../../server/data/events'
import { makeUser, type Client } from '../helpers/api'
import { openCase } from '../helpers/cases'
import { connectSocket, emitAck, httpClient, joinedSockets, nextEvent, useServer } from '../helpers/sockets'
import { png, responseText } from '../unit/uploads/make-files'

/**
 * Issue 13, finding 1: everything derived from an internal note — its attached files, their history
 * entries, live payloads, downloads — stays with the team. One rule decides it (server/data/visibility.ts);
 * these tests walk every read path the listener has.
 */
const running = useServer()
let PHOTO: Buffer
beforeAll(async () => {
  PHOTO = await png(40, 30)
})

const signIn = (email: string, password: string) => httpClient(running.server.url, email, password)
const uploadAs = (c: Client, caseId: string, bytes: Buffer | string, name: string) =>
  c.agent.post(`/api/cases/${caseId}/files`).set('X-CSRF-Token', c.csrf).attach('file', Buffer.from(bytes), name).expect(201).then((r) => r.body as { id: string; name: string })

/** Every payload a socket receives, as one string, to search for ids and names. */
function recorder(s: Socket) {
  const seen: string[] = []
  s.onAny((event, payload) => seen.push(`${event} ${JSON.stringify(payload)}`))
  return { text: () => seen.join('\n'), events: seen }
}

async function scene() {
  const tag = randomUUID().slice(0, 8)
  const l = await makeUser('listener', 'Attachment Listener')
  const a = await makeUser('advisor', 'Attachment Advisor')
  const listener = await signIn(l.email, l.password)
  const advisor = await signIn(a.email, a.password)
  const { case: c } = await openCase(listener)
  return { tag, listener, advisor, caseId: c.id }
}

describe("an internal note's attachments stay with the team", () => {
  it('the listener never sees the file: not in the file list, the thread, the history, the socket or a download; the team sees all of it', async () => {
    const { tag, listener, advisor, caseId } = await scene()
    const [ls, as] = await joinedSockets(running.server.url, caseId, listener.cookie, advisor.cookie)
    const heard = recorder(ls)
    try {
      const noteName = `note-only-${tag}.png`
      const noteFile = await uploadAs(advisor, caseId, PHOTO, noteName)
      const noteMeasurement = await uploadAs(advisor, caseId, responseText(40), `note-only-${tag}.txt`)
      const teamSaw = nextEvent(as, 'case.message', (p: { internal: boolean }) => p.internal)
      const note = (await advisor.post(`/api/cases/${caseId}/messages`, { body: 'Internal: the 41 Hz mode looks worse on this photo', internal: true, fileIds: [noteFile.id, noteMeasurement.id] }).expect(201)).body
      await teamSaw
      // an analysis entry about the note's measurement, as the analysis job writes it
      await insertEvent({ caseId, actorId: null, kind: 'analysis', data: { fileId: noteMeasurement.id, status: 'done', name: `note-only-${tag}.txt` } })
      const pendingName = `not-sent-yet-${tag}.png`
      const pending = await uploadAs(advisor, caseId, PHOTO, pendingName)
      // a public reply afterwards, so the listener's socket certainly heard the case's traffic
      const sharedName = `shared-${tag}.png`
      const shared = await uploadAs(advisor, caseId, PHOTO, sharedName)
      const listenerSaw = nextEvent(ls, 'case.message', () => true)
      await advisor.post(`/api/cases/${caseId}/messages`, { body: 'Here is where the panel goes', fileIds: [shared.id] }).expect(201)
      await listenerSaw
      await new Promise((r) => setTimeout(r, 300))

      const secrets = [noteFile.id, noteMeasurement.id, noteName, `note-only-${tag}.txt`, pending.id, pendingName, note.id]
      const files = await listener.get(`/api/cases/${caseId}/files`).expect(200)
      const thread = await listener.get(`/api/cases/${caseId}/messages`).expect(200)
      const history = await listener.get(`/api/cases/${caseId}/events`).expect(200)
      const caughtUp = await emitAck(ls, 'case.join', { caseId, afterSeq: 0 })
      for (const [where, text] of [['files', files.text], ['thread', thread.text], ['history', history.text], ['socket catch-up', JSON.stringify(caughtUp)], ['live payloads', heard.text()]] as const) {
        for (const s of secrets) expect(text.includes(s), `${where} shows ${s}`).toBe(false)
      }
      // what went out with the reply is shared, with its history entry
      expect(files.body.files.map((f: { id: string }) => f.id)).toContain(shared.id)
      expect(history.text).toContain(sharedName)
      for (const id of [noteFile.id, noteMeasurement.id, pending.id]) {
        await listener.get(`/api/files/${id}`).expect(404)
        await listener.get(`/api/files/${id}/thumbnail`).expect(404)
      }
      await listener.get(`/api/files/${shared.id}`).expect(200)

      // the team sees everything
      const teamFiles = (await advisor.get(`/api/cases/${caseId}/files`).expect(200)).body.files.map((f: { id: string }) => f.id)
      expect(teamFiles).toEqual(expect.arrayContaining([noteFile.id, noteMeasurement.id, pending.id, shared.id]))
      const teamHistory = (await advisor.get(`/api/cases/${caseId}/events`).expect(200)).text
      expect(teamHistory).toContain(noteName)
      expect(teamHistory).toContain(pendingName)
      await advisor.get(`/api/files/${noteFile.id}`).expect(200)
      expect(heard.events.some((e) => e.startsWith('case.event') && e.includes('"kind":"file"') && e.includes('"internal":true')), 'a team-only file event reached the listener').toBe(false)
    } finally {
      ls.disconnect()
      as.disconnect()
    }
  })

  it("the team's upload goes to the team's socket room only; the listener's own upload to both", async () => {
    const { listener, advisor, caseId } = await scene()
    const [ls, as] = await joinedSockets(running.server.url, caseId, listener.cookie, advisor.cookie)
    const heard = recorder(ls)
    try {
      const teamGot = nextEvent<{ kind: string; internal?: boolean }>(as, 'case.event', (e) => e.kind === 'file')
      await uploadAs(advisor, caseId, PHOTO, 'team-upload.png')
      expect(await teamGot).toMatchObject({ kind: 'file', internal: true })
      const ownGot = nextEvent<{ kind: string }>(ls, 'case.event', (e) => e.kind === 'file')
      await uploadAs(listener, caseId, PHOTO, 'my-upload.png')
      await ownGot
      expect(heard.events.filter((e) => e.includes('"kind":"file"'))).toHaveLength(1)
    } finally {
      ls.disconnect()
      as.disconnect()
    }
  })

  it("nobody attaches another person's upload to their message (the listener's photo cannot become an internal note's)", async () => {
    const { listener, advisor, caseId } = await scene()
    const mine = await uploadAs(listener, caseId, PHOTO, 'listener-photo.png')
    const res = await advisor.post(`/api/cases/${caseId}/messages`, { body: 'Filed away', internal: true, fileIds: [mine.id] }).expect(400)
    expect(res.body.error.fields[0].path).toBe('fileIds')
    await listener.get(`/api/files/${mine.id}`).expect(200)
    const theirs = await uploadAs(advisor, caseId, PHOTO, 'advisor-photo.png')
    await listener.post(`/api/cases/${caseId}/messages`, { body: 'Can I have this?', fileIds: [theirs.id] }).expect(400)
    await listener.get(`/api/files/${theirs.id}`).expect(404)
  })
})
