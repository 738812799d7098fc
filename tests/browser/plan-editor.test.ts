import { describe, expect, it } from 'vitest'
import { join } from 'node:path'
import { screenshotDir, signInAs, useProduct } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { sessionFor } from '../helpers/sockets'
import { testRoom } from '../helpers/rooms'

const app = useProduct()

/** A signed-in API agent against the running product. */
const agentFor = (user: { email: string; password: string }) => sessionFor(app.server.url, user.email, user.password)

describe('the plan editor', () => {
  it('an advisor places a panel on a reflection point, sees the prediction, saves and sends; the listener opens the printable plan', async () => {
    const listener = await makeUser('listener', 'Browser Plan Listener')
    const advisor = await makeUser('advisor', 'Browser Plan Advisor')
    const l = await agentFor(listener)
    const room = (await l.agent.post('/api/rooms').set('X-CSRF-Token', l.csrf).send(testRoom()).expect(201)).body
    const c = (await l.agent.post('/api/cases').set('X-CSRF-Token', l.csrf).send({ roomId: room.id, title: 'Browser plan: hard side walls' }).expect(201)).body
    await l.agent.patch(`/api/cases/${c.id}`).set('X-CSRF-Token', l.csrf).send({ status: 'submitted', fromStatus: 'draft' }).expect(200)
    const a = await agentFor(advisor)
    await a.agent.patch(`/api/cases/${c.id}`).set('X-CSRF-Token', a.csrf).send({ status: 'in_review', fromStatus: 'submitted' }).expect(200)

    const context = await app.browser.newContext({ viewport: { width: 1500, height: 1000 } })
    const page = await signInAs(context, app.server.url, advisor.email, advisor.password)
    await page.waitForURL(/\/queue(\?|$)/)
    await page.goto(`${app.server.url}/desk/cases/${c.id}/plan`)
    const target = page.getByTestId('plan-target-mirror-L-left')
    await target.waitFor({ timeout: 20_000 })
    await target.hover()
    await expect.poll(() => page.getByTestId('plan-target-reason').textContent()).toMatch(/First reflection of speaker L off the left wall/)
    await target.click()
    await page.getByTestId('plan-item-panel-1').waitFor()
    await expect.poll(() => page.getByTestId('plan-summary-panel-1').textContent(), { timeout: 15_000 }).toMatch(/catches the left wall reflection of speaker L/)
    await page.getByTestId('plan-target-corner-front-left').click()
    await page.getByTestId('plan-target-corner-front-right').click()
    await expect.poll(() => page.getByTestId('plan-order').locator('li').count(), { timeout: 15_000 }).toBe(3)
    await page.screenshot({ path: join(screenshotDir(), 'plan-editor.png'), fullPage: true })

    await page.getByTestId('plan-save').click()
    await page.getByTestId('plan-saved-note').waitFor({ timeout: 15_000 })
    await page.getByTestId('plan-send').click()
    await page.getByTestId('plan-send-message').locator('textarea').fill('Start with the corners.')
    await page.getByTestId('plan-send-confirm').click()
    await page.getByTestId('plan-sent-note').waitFor({ timeout: 15_000 })
    expect((await l.agent.get(`/api/cases/${c.id}`)).body.status).toBe('plan_sent')
    await context.close()

    const lc = await app.browser.newContext({ viewport: { width: 1100, height: 1000 } })
    const lp = await signInAs(lc, app.server.url, listener.email, listener.password)
    await lp.waitForURL(/\/cases$/)
    await lp.goto(`${app.server.url}/cases/${c.id}/plans/1/report`)
    await lp.getByTestId('plan-report').waitFor({ timeout: 15_000 })
    await expect.poll(() => lp.getByTestId('plan-steps').locator('li').count()).toBe(3)
    expect(await lp.getByTestId('plan-cautions').textContent()).toMatch(/fixings rated for the load/)
    expect(await lp.getByTestId('plan-shopping-total').textContent()).toMatch(/m²/)
    await lp.screenshot({ path: join(screenshotDir(), 'plan-report.png'), fullPage: true })
    await lc.close()
  }, 90_000)
})
