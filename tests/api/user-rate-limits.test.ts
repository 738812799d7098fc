/**
 * Per-user limits (server/middleware/user-rate-limit.ts): small budgets set through the environment, as
 * `npm test` and the benches set large ones. Two app instances on one database stand for two nodes behind
 * a balancer, each with its own limiter objects: the counters live in PostgreSQL (rate_limit_hits).
 * Requests here are cheap on purpose: a preview of an empty body answers 400 after the limiter has counted it.
 */
import { describe, expect, it } from 'vitest'
import request from 'supertest'

const { appNodes } = await import('../helpers/nodes')
const { nodes, more } = await appNodes({ PREVIEW_RATE_LIMIT: '3', MESSAGE_RATE_LIMIT: '3', SEARCH_RATE_LIMIT: '2', USER_RATE_WINDOW_SECONDS: '600' })
// a third node whose window is one second
const shortWindow = more({ USER_RATE_WINDOW_SECONDS: '1' })
const { makeUser, clientOf } = await import('../helpers/api')
const { tooManyWords } = await import('../../shared/words/limits')

const preview = (c: Awaited<ReturnType<typeof clientOf>>) => c.post('/api/rooms/preview', {})

describe('per-user limits', () => {
  it('a listener past the preview limit gets 429 with Retry-After and the words of shared/words/limits.ts; another listener is not affected', async () => {
    const a = await clientOf(nodes[0].app, await makeUser('listener'))
    const b = await clientOf(nodes[0].app, await makeUser('listener'))
    for (let i = 0; i < 3; i++) await preview(a).expect(400)
    const res = await preview(a).expect(429)
    const wait = Number(res.headers['retry-after'])
    expect(Number.isInteger(wait)).toBe(true)
    expect(wait).toBeGreaterThanOrEqual(1)
    expect(wait).toBeLessThanOrEqual(600)
    expect(res.body.error.code).toBe('too_many_requests')
    expect(res.body.error.message).toBe(tooManyWords('previews', wait))
    expect(res.body.error.message).toMatch(/asked for a lot of previews/)
    // another person has a budget of their own
    for (let i = 0; i < 3; i++) await preview(b).expect(400)
    // and the limited person's other actions have theirs (a message to no case: counted, then 400 for the empty body)
    await a.post('/api/cases/00000000-0000-4000-8000-000000000001/messages', {}).expect(400)
  })

  it('only the team\'s full-text searches count: queue pages without a search and a listener\'s list are never limited', async () => {
    const adv = await clientOf(nodes[0].app, await makeUser('advisor'))
    await adv.get('/api/cases?q=boomy').expect(200)
    await adv.get('/api/cases?q=boomy').expect(200)
    const res = await adv.get('/api/cases?q=boomy').expect(429)
    expect(res.body.error.message).toBe(tooManyWords('search', Number(res.headers['retry-after'])))
    await adv.get('/api/cases').expect(200)
    const lis = await clientOf(nodes[0].app, await makeUser('listener'))
    for (let i = 0; i < 4; i++) await lis.get('/api/cases?q=boomy').expect(200)
  })

  it('one person\'s requests spread over two nodes count against one budget (PostgreSQL holds the counters)', async () => {
    const u = await makeUser('listener')
    const on0 = await clientOf(nodes[0].app, u)
    const on1 = await clientOf(nodes[1].app, u)
    await preview(on0).expect(400)
    await preview(on1).expect(400)
    await preview(on0).expect(400)
    await preview(on1).expect(429)
    await preview(on0).expect(429)
  })

  it('the budget comes back once its window has ended (a one-second window)', async () => {
    const c = await clientOf(shortWindow.app, await makeUser('listener'))
    // requests until refused: a window that ends midway only makes this take a few more
    let refused: request.Response | undefined
    for (let i = 0; i < 30 && !refused; i++) {
      const r = await preview(c)
      if (r.status === 429) refused = r
      else expect(r.status).toBe(400)
    }
    expect(refused).toBeDefined()
    const wait = Number(refused!.headers['retry-after'])
    expect(wait).toBeLessThanOrEqual(1)
    await new Promise((r) => setTimeout(r, wait * 1000 + 300))
    await preview(c).expect(400)
  })
})
