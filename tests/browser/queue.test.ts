import { describe, expect, it } from 'vitest'
import { join } from 'node:path'
import { screenshotDir, signInAs, useProduct } from '../helpers/browser'
import { closeTestApp, makeUser, signedIn } from '../helpers/api'
import { openCase } from '../helpers/cases'

const app = useProduct({ after: closeTestApp })

describe("the advisor's queue", () => {
  it('opens on open work, says so, and shows closed cases one click away', async () => {
    const advisor = await makeUser('advisor', 'Browser Queue Advisor')
    const listener = await signedIn('listener')
    const staff = await signedIn('advisor')
    const { case: open } = await openCase(listener.c, { title: 'Queue browser: flutter in the attic' })
    const { case: done } = await openCase(listener.c, { title: 'Queue browser: already settled' })
    await staff.c.patch(`/api/cases/${done.id}`, { status: 'closed', fromStatus: 'submitted' }).expect(200)

    const context = await app.browser.newContext({ viewport: { width: 1440, height: 900 } })
    const page = await signInAs(context, app.server.url, advisor.email, advisor.password)
    await page.waitForURL(/\/queue(\?|$)/, { timeout: 15_000 })
    await expect.poll(() => page.getByTestId('queue-coverage').textContent(), { timeout: 15_000 }).toMatch(/open work.*what needs an answer first/)
    const rowIds = () => page.getByTestId('queue-row').evaluateAll((rows) => rows.map((r) => r.getAttribute('data-case-id')))
    await expect.poll(rowIds, { timeout: 15_000 }).toContain(open.id)
    expect(await rowIds()).not.toContain(done.id)
    await page.screenshot({ path: join(screenshotDir(), 'queue-open-work.png'), fullPage: true })

    await page.getByTestId('queue-show-closed').click()
    await expect.poll(() => page.getByTestId('queue-coverage').textContent()).toMatch(/closed/i)
    await expect.poll(rowIds, { timeout: 15_000 }).toContain(done.id)
    expect(await rowIds()).not.toContain(open.id)
    await page.getByTestId('queue-show-open').click()
    await expect.poll(rowIds, { timeout: 15_000 }).toContain(open.id)
    await context.close()
  }, 90_000)
})
