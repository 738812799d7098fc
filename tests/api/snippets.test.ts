import { afterAll, describe, expect, it } from 'vitest'
import { randomUUID } from 'node:crypto'
import { closeTestApp, signedIn } from '../helpers/api'

afterAll(closeTestApp)

const titles = (list: { title: string }[]) => list.map((s) => s.title)

describe('personal snippets belong to their author', () => {
  it("a colleague can neither see, overwrite nor delete an advisor's personal snippet (404), and it stays as written", async () => {
    const author = await signedIn('advisor')
    const colleague = await signedIn('advisor')
    const supervisor = await signedIn('supervisor')
    const title = `Corner traps for Kestrel ${randomUUID().slice(0, 6)}`
    const mine = (await author.c.post('/api/snippets', { title, body: 'Stack 10 cm mineral wool in the front corners, {{listener.name}}.' }).expect(201)).body
    expect(mine).toMatchObject({ scope: 'personal', author: { id: author.user.id } })

    for (const other of [colleague, supervisor]) {
      expect(titles((await other.c.get('/api/snippets').expect(200)).body.snippets)).not.toContain(title)
      await other.c.put(`/api/snippets/${mine.id}`, { title: 'Hijacked', body: 'Overwritten by someone else' }).expect(404)
      await other.c.delete(`/api/snippets/${mine.id}`).expect(404)
    }
    const list = (await author.c.get('/api/snippets').expect(200)).body.snippets
    expect(list.find((s: { id: string }) => s.id === mine.id)).toMatchObject({ title, body: 'Stack 10 cm mineral wool in the front corners, {{listener.name}}.' })

    const edited = (await author.c.put(`/api/snippets/${mine.id}`, { title, body: 'Use 15 cm instead.' }).expect(200)).body
    expect(edited.body).toBe('Use 15 cm instead.')
    await author.c.delete(`/api/snippets/${mine.id}`).expect(204)
    await author.c.delete(`/api/snippets/${mine.id}`).expect(404)
  })

  it('deleting or editing an unknown snippet answers 404, not 204', async () => {
    const { c } = await signedIn('advisor')
    const res = await c.delete(`/api/snippets/${randomUUID()}`).expect(404)
    expect(res.body.error.code).toBe('not_found')
    await c.put(`/api/snippets/${randomUUID()}`, { title: 'Nothing here', body: 'x' }).expect(404)
  })

  it('two advisors may each keep a personal snippet with the same title; a second one of your own is 409', async () => {
    const a = await signedIn('advisor')
    const b = await signedIn('advisor')
    const title = `Rear wall diffusion ${randomUUID().slice(0, 6)}`
    await a.c.post('/api/snippets', { title, body: 'A' }).expect(201)
    await b.c.post('/api/snippets', { title, body: 'B' }).expect(201)
    expect((await a.c.post('/api/snippets', { title: title.toUpperCase(), body: 'again' }).expect(409)).body.error.code).toBe('duplicate')
  })
})

describe('team snippets: shared, and every change is in the audit log', () => {
  it('a colleague edits and then deletes a team snippet; each step is audited with the earlier words', async () => {
    const author = await signedIn('advisor')
    const colleague = await signedIn('advisor')
    const supervisor = await signedIn('supervisor')
    const title = `First reflection panels ${randomUUID().slice(0, 6)}`
    const team = (await author.c.post('/api/snippets', { title, body: 'Panels at the mirror points on both side walls.', scope: 'team' }).expect(201)).body
    expect(team.scope).toBe('team')
    expect(titles((await colleague.c.get('/api/snippets').expect(200)).body.snippets)).toContain(title)

    await colleague.c.put(`/api/snippets/${team.id}`, { title, body: 'Panels at the side-wall mirror points, 5 cm thick at least.', scope: 'personal' }).expect(200)
    // the scope is fixed at creation: a PUT cannot take a team snippet private
    expect((await author.c.get('/api/snippets').expect(200)).body.snippets.find((s: { id: string }) => s.id === team.id).scope).toBe('team')
    await colleague.c.delete(`/api/snippets/${team.id}`).expect(204)

    const audit = (await supervisor.c.get(`/api/audit?actorId=${colleague.user.id}`).expect(200)).body.entries
    expect(audit.map((e: { action: string }) => e.action)).toEqual(['snippet.team_deleted', 'snippet.team_changed'])
    expect(audit[1].details).toMatchObject({ snippetId: team.id, before: { title, body: 'Panels at the mirror points on both side walls.' }, authorId: author.user.id })
    expect(audit[0].details).toMatchObject({ snippetId: team.id, title, body: 'Panels at the side-wall mirror points, 5 cm thick at least.' })
    const created = (await supervisor.c.get(`/api/audit?actorId=${author.user.id}&action=snippet.team_created`).expect(200)).body.entries
    expect(created[0].details).toMatchObject({ snippetId: team.id, title })
  })

  it('personal snippets write nothing to the audit log', async () => {
    const a = await signedIn('advisor')
    const sup = await signedIn('supervisor')
    const s = (await a.c.post('/api/snippets', { title: `Quiet one ${randomUUID().slice(0, 6)}`, body: 'x' }).expect(201)).body
    await a.c.put(`/api/snippets/${s.id}`, { title: s.title, body: 'y' }).expect(200)
    await a.c.delete(`/api/snippets/${s.id}`).expect(204)
    expect((await sup.c.get(`/api/audit?actorId=${a.user.id}`).expect(200)).body.entries).toHaveLength(0)
  })
})
