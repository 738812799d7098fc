import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { randomUUID } from 'node:crypto'
import { join } from 'node:path'
import { failingAnswers, screenshotDir, signInAs, useProduct } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { createRoom } from '../../server/services/rooms'
import { createCase, updateCase } from '../../server/services/cases'
import { postMessage } from '../../server/services/messages'
import { createPlan, sendPlan } from '../../server/services/plans'
import { addCaseFile } from '../../server/services/files'
import { storage } from '../../server/storage'
import { demoRooms } from '../../server/seed/rooms'
import { demoPlanBody } from '../../server/seed/demo-plan'
import { syntheticImpulseResponse } from '../../server/seed/synthetic-measurement'
import { roomSchema } from '../../shared/schemas/room'

const app = useProduct()

/** Every answer of 400 or more the page receives from our own server. */
const failures = (page: Page) => failingAnswers(page, app.server.url)

async function listenerCase(title: string) {
  const listener = await makeUser('listener', 'Yara Feldhaus')
  const room = await createRoom(listener, roomSchema.parse({ ...demoRooms.smallStudio, name: 'Studio under the stairs' }))
  const c = await createCase(listener, { roomId: room.id, title, description: 'The bass is **heavy** at the desk and thin in the car.' })
  return { listener, room, c }
}

describe("the listener's case page follows the case live", () => {
  it('a plan, a reply, a status move, a file and its analysis appear without a reload', async () => {
    const advisor = await makeUser('advisor', 'Bartholomew Nkemelu')
    const { listener, room, c } = await listenerCase(`Live plan ${randomUUID().slice(0, 6)}`)
    await updateCase(listener, c.id, { status: 'submitted', fromStatus: 'draft' })
    await updateCase(advisor, c.id, { status: 'in_review', fromStatus: 'submitted' })

    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await signInAs(context, app.server.url, listener.email, listener.password)
    await page.waitForURL(/\/cases$/)
    await page.goto(`${app.server.url}/cases/${c.id}`, { waitUntil: 'networkidle' })
    await page.getByTestId('plan-none-yet').waitFor()
    let reloads = 0
    page.on('framenavigated', (f) => f === page.mainFrame() && reloads++)

    await postMessage(advisor, c.id, { body: 'Hello Yara, the modes pile up at 52 Hz right at your chair.' })
    await expect.poll(() => page.getByTestId('thread').textContent(), { timeout: 20_000 }).toMatch(/pile up at 52 Hz/)

    const bytes = syntheticImpulseResponse(room.room, 'L', { seed: 77 })
    const key = `incoming/${randomUUID()}.wav`
    await storage().put(key, Buffer.from(bytes))
    await addCaseFile(listener, c.id, { key, size: bytes.length, originalname: 'left-at-desk.wav', mime: 'audio/wav', mimetype: 'audio/wav', kind: 'measurement', format: 'wav', fieldname: 'file' })
    await expect.poll(() => page.getByTestId('measurement').count(), { timeout: 20_000 }).toBe(1)
    await expect.poll(() => page.getByTestId('analysis-status-done').count(), { timeout: 120_000 }).toBe(1)

    const plan = await createPlan(advisor, c.id, demoPlanBody(room.room, 'Corner traps first.'))
    await sendPlan(advisor, c.id, plan.version, { fromStatus: 'in_review', message: 'Here is your plan.' })
    await expect.poll(() => page.getByTestId('plan-for-listener').textContent(), { timeout: 20_000 }).toMatch(/What to do, in this order/)
    await expect.poll(() => page.getByTestId('case-status').first().textContent()).toMatch(/plan/i)
    expect(reloads).toBe(0)
    await context.close()
  }, 240_000)

  it('a draft case page makes no request that fails (no triage is asked for before submission)', async () => {
    const { listener, c } = await listenerCase('Draft without a triage')
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await signInAs(context, app.server.url, listener.email, listener.password)
    await page.waitForURL(/\/cases$/)
    const failed = failures(page)
    await page.goto(`${app.server.url}/cases/${c.id}`, { waitUntil: 'networkidle' })
    await page.getByTestId('case-submit').waitFor()
    expect(failed).toEqual([])
    await context.close()
  })
})

describe('the desk confirms each action where the eye is', () => {
  it('claim, hand-over, keeping a snippet and saving a filter each say what happened beside the control', async () => {
    const me = await makeUser('advisor', 'Cosima Threlkeld')
    const colleague = await makeUser('advisor', 'Dorian Achebe')
    const title = `Feedback case ${randomUUID().slice(0, 6)}`
    const { listener, c } = await listenerCase(title)
    await updateCase(listener, c.id, { status: 'submitted', fromStatus: 'draft' })

    const context = await app.browser.newContext({ viewport: { width: 1440, height: 900 } })
    const page = await signInAs(context, app.server.url, me.email, me.password)
    page.setDefaultTimeout(30_000)
    await page.waitForURL(/\/queue(\?|$)/)
    await page.getByTestId('queue-search').locator('input').fill(title)
    const row = page.getByTestId('queue-row').filter({ hasText: title })
    await row.getByTestId('claim-button').click()
    await expect.poll(() => row.getByTestId('claimed-confirm').textContent(), { timeout: 15_000 }).toMatch(/Claimed/)

    await page.getByTestId('save-filter').click()
    await page.getByTestId('save-filter-name').locator('input').fill('My feedback search')
    await page.getByTestId('save-filter-confirm').click()
    await expect.poll(() => page.getByTestId('saved-filter-confirm').textContent()).toMatch(/Saved as "My feedback search"/)

    await page.goto(`${app.server.url}/desk/cases/${c.id}`)
    const composer = page.getByTestId('composer-input')
    await composer.locator('textarea').first().fill('Thanks for writing in; I will look at the bass modes at your desk today.')
    await page.getByTestId('snippet-picker').click()
    await page.getByTestId('snippet-save').click()
    await page.getByTestId('snippet-title').locator('input').fill('Looking at it today')
    await page.getByTestId('snippet-title-save').click()
    await expect.poll(() => page.getByTestId('snippet-kept').textContent()).toMatch(/Kept as your snippet "Looking at it today"/)

    await page.getByTestId('handover-button').click()
    await page.getByTestId('handover-target').click()
    await page.getByRole('option', { name: /Dorian Achebe/ }).click()
    await page.getByTestId('handover-confirm').click()
    await expect.poll(() => page.getByTestId('assignment-confirm').textContent(), { timeout: 15_000 }).toMatch(/Handed over to Dorian Achebe/)
    await page.screenshot({ path: join(screenshotDir(), 'workspace-handed-over.png') })

    // taking it back is refused for an advisor: the refusal shows in the same place
    await page.getByTestId('claim-button').click()
    await expect.poll(() => page.getByTestId('assignment-confirm').textContent(), { timeout: 15_000 }).toMatch(/Dorian Achebe already has this case/)
    void colleague
    await context.close()
  }, 180_000)

  it("a supervisor's reassignment from the dashboard is confirmed in the case's own row, at desktop and phone width", async () => {
    const supervisor = await makeUser('supervisor', 'Henrike Oyelowo')
    const advisor = await makeUser('advisor', 'Lazarus Quennell')
    const title = `Overdue case ${randomUUID().slice(0, 6)}`
    const { listener, c } = await listenerCase(title)
    await updateCase(listener, c.id, { status: 'submitted', fromStatus: 'draft' })
    // submitted three days ago, never answered: past any first-response target of a day or two
    const { db } = await import('../../server/db/sequelize')
    await db().query(`UPDATE case_events SET created_at = created_at - interval '3 days' WHERE case_id = $1`, { bind: [c.id] })
    for (const viewport of [{ width: 1280, height: 900 }, { width: 390, height: 844 }]) {
      const context = await app.browser.newContext({ viewport, isMobile: viewport.width < 600, hasTouch: viewport.width < 600 })
      const page = await signInAs(context, app.server.url, supervisor.email, supervisor.password)
      page.setDefaultTimeout(30_000)
      await page.waitForURL(/\/dashboard$/)
      const row = page.getByTestId(`breach-${c.id}`)
      await row.waitFor()
      await row.getByTestId('reassign-select').click()
      await page.getByRole('option', { name: viewport.width < 600 ? /Back to the queue/ : /Lazarus Quennell/ }).click()
      await row.getByTestId('reassign-button').click()
      await expect.poll(() => row.getByTestId('reassign-confirm').textContent(), { timeout: 15_000 }).toMatch(viewport.width < 600 ? /Back in the queue for anyone to take/ : /Handed to Lazarus Quennell/)
      expect(await row.getByTestId('reassign-confirm').isVisible()).toBe(true)
      await page.screenshot({ path: join(screenshotDir(), `dashboard-reassigned-${viewport.width}.png`) })
      await context.close()
    }
    void advisor
  }, 180_000)
})
