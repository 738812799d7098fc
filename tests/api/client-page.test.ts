import { afterAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { createApp } from '../../server/app'
import { jsonForScript } from '../../server/middleware/client-page'
import { sessionSchema } from '../../shared/schemas/auth'
import { clientOf, makeUser } from '../helpers/api'

const dir = mkdtempSync(join(tmpdir(), 'roomwright-client-page-'))
writeFileSync(join(dir, 'index.html'), '<!doctype html><html><head><title>Roomwright</title></head><body><div id="app"></div></body></html>')
const built = createApp({ clientDir: dir })

afterAll(async () => {
  await built.close()
  rmSync(dir, { recursive: true, force: true })
  const { closeDb } = await import('../../server/db/sequelize')
  await closeDb()
})

/** The session the page carries, read as the client reads it (src/api/auth.ts). */
function sessionIn(html: string) {
  const m = /<script id="rw-session" type="application\/json">(.*?)<\/script>/s.exec(html)
  if (!m) throw new Error(`no session in the page: ${html}`)
  return sessionSchema.parse(JSON.parse(m[1]))
}

describe('the client page carries the session', () => {
  it('signed out: the page says nobody is signed in, and is never stored', async () => {
    const res = await request(built.app).get('/cases/some-id').expect(200)
    expect(res.headers['content-type']).toMatch(/text\/html/)
    expect(res.headers['cache-control']).toBe('no-store')
    expect(res.headers.etag).toBeUndefined()
    expect(sessionIn(res.text)).toEqual({ user: null })
  })
  it('signed in: the same user as GET /api/auth/session, and null again after sign-out', async () => {
    const user = await makeUser('listener', 'Page </script><script>alert(1)</script> & Co')
    const c = await clientOf(built.app, user)
    const api = (await c.get('/api/auth/session').expect(200)).body
    const page = await c.get('/queue').expect(200)
    expect(page.text).not.toContain('<script>alert(1)')
    expect(sessionIn(page.text)).toEqual(api)
    await c.post('/api/auth/logout').expect(204)
    expect(sessionIn((await c.get('/queue').expect(200)).text)).toEqual({ user: null })
  })
  it('the JSON cannot end its element or open a comment, and reads back the same', () => {
    const value = { name: '</script><!-- & \u2028\u2029 >' }
    const text = jsonForScript(value)
    expect(text).not.toMatch(/[<>&\u2028\u2029]/)
    expect(JSON.parse(text)).toEqual(value)
  })
})
