import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { join } from 'node:path'
import { screenshotDir, signInAs, useProduct } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { sessionFor } from '../helpers/sockets'
import { testRoom } from '../helpers/rooms'

const app = useProduct()

/** What reaches past the right edge of its column in the plan editor (tag, class and test id of each). */
function overflowing(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = []
    for (const col of document.querySelectorAll<HTMLElement>('.plan-editor__col')) {
      const edge = col.getBoundingClientRect().right
      for (const el of col.querySelectorAll<HTMLElement>('*')) {
        const r = el.getBoundingClientRect()
        if (r.width > 0 && r.right > edge + 1) out.push(`${el.tagName.toLowerCase()}.${String((el.className as unknown as { baseVal?: string }).baseVal ?? el.className).split(' ')[0]} ${el.dataset.testid ?? ''} (${Math.round(r.right - edge)} px past)`.trim())
      }
    }
    return out.slice(0, 12)
  })
}

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

    // At 1440 px the three columns sit side by side: nothing in them reaches past its column, and the
    // reflections table shows every column without scrolling inside its box.
    await page.setViewportSize({ width: 1440, height: 1000 })
    await page.getByTestId('plan-reflections').locator('tbody tr').first().waitFor()
    await expect.poll(() => overflowing(page), { timeout: 10_000 }).toEqual([])
    const table = await page.getByTestId('plan-reflections').evaluate((t) => {
      const wrapper = t.querySelector('.v-table__wrapper') as HTMLElement
      const right = wrapper.getBoundingClientRect().right
      return { scroll: wrapper.scrollWidth, client: wrapper.clientWidth, clippedHeads: [...t.querySelectorAll('th')].filter((th) => th.getBoundingClientRect().right > right + 1).map((th) => th.textContent) }
    })
    expect(table.clippedHeads).toEqual([])
    expect(table.scroll).toBeLessThanOrEqual(table.client + 1)
    await page.screenshot({ path: join(screenshotDir(), 'plan-editor-1440.png'), fullPage: true })

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
    // printed, the page is the plan alone: no Back/Print/PDF bar, no app bar or navigation drawer
    expect(await lp.getByTestId('plan-report-bar').isVisible()).toBe(true)
    await lp.emulateMedia({ media: 'print' })
    expect(await lp.getByTestId('plan-report-bar').isVisible()).toBe(false)
    expect(await lp.getByTestId('plan-print').isVisible()).toBe(false)
    const chromeShown = await lp.locator('.v-app-bar, .v-navigation-drawer, nav').evaluateAll((els) =>
      els.filter((e) => getComputedStyle(e).display !== 'none' && e.getBoundingClientRect().height > 0).map((e) => e.className))
    expect(chromeShown).toEqual([])
    expect(await lp.getByTestId('plan-steps').isVisible()).toBe(true)
    await lp.screenshot({ path: join(screenshotDir(), 'plan-report-print.png'), fullPage: true })
    await lc.close()
  }, 90_000)
})
