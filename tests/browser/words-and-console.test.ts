import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { signInAs, useProduct } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { caseInReview } from '../helpers/service-cases'
import { createRoom } from '../../server/services/rooms'
import { createCase, updateCase } from '../../server/services/cases'
import { demoRooms } from '../../server/seed/rooms'
import { roomSchema } from '../../shared/schemas/room'
import { invite } from '../../server/services/team'
import { caseStatusLabels, flagLabel, formatDateTime } from '../../shared/words'
import { accountStory, caseAnswerWords } from '../../shared/words/people'

const app = useProduct({ timeout: 120_000 })

describe('a case description is read as markdown, through the one shared renderer', () => {
  it('the listener and the advisor see bold text, never the asterisks, and typed HTML stays text', async () => {
    const listener = await makeUser('listener', 'Ottilie Brannagh')
    const advisor = await makeUser('advisor', 'Ismael Oduya')
    const room = await createRoom(listener, roomSchema.parse({ ...demoRooms.smallStudio, name: 'Box room' }))
    const c = await createCase(listener, {
      roomId: room.id, title: 'Booming desk',
      description: 'The bass **booms** at the desk.\n\n<img src=x onerror="window.__pwned=1">',
    })
    await updateCase(listener, c.id, { status: 'submitted', fromStatus: 'draft' })

    for (const [who, path] of [[listener, `/cases/${c.id}`], [advisor, `/desk/cases/${c.id}`]] as const) {
      const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
      const page = await signInAs(context, app.server.url, who.email, who.password)
      await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'))
      await page.goto(`${app.server.url}${path}`, { waitUntil: 'networkidle' })
      const box = page.getByTestId('case-description-text').first()
      await box.waitFor()
      expect(await box.locator('strong').first().textContent()).toBe('booms')
      expect(await box.textContent()).not.toContain('**')
      // raw HTML a writer types is shown as text, not parsed (shared/markdown.ts rule 1)
      expect(await box.locator('img').count()).toBe(0)
      expect(await box.textContent()).toContain('<img')
      expect(await page.evaluate(() => (window as unknown as { __pwned?: number }).__pwned)).toBeUndefined()
      await context.close()
    }
  }, 180_000)
})

/** Console errors and answers of 400 or more from our own server, from the moment the page opens. */
function watch(page: Page): string[] {
  const seen: string[] = []
  page.on('console', (m) => m.type() === 'error' && seen.push(`console: ${m.text()}`))
  page.on('pageerror', (e) => seen.push(`pageerror: ${e.message}`))
  page.on('response', (r) => {
    if (r.status() >= 400 && r.url().startsWith(app.server.url)) seen.push(`${r.status()} ${r.request().method()} ${new URL(r.url()).pathname}`)
  })
  page.on('requestfailed', (r) => seen.push(`failed: ${r.url()}`))
  return seen
}

describe('a signed-out visitor', () => {
  it('opens the sign-in and sign-up pages with no failing request and no console error', async () => {
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await context.newPage()
    page.setDefaultTimeout(45_000)
    const seen = watch(page)
    for (const path of ['/', '/sign-in', '/sign-up']) {
      await page.goto(`${app.server.url}${path}`, { waitUntil: 'networkidle' })
      // on a loaded machine "network idle" can come between the session answer and the page's own chunks:
      // wait for the form itself, so the next visit does not cut a chunk's download short
      await page.getByTestId('signin-email').or(page.getByTestId('signup-email')).first().waitFor()
      await page.waitForLoadState('networkidle')
    }
    await page.getByTestId('signin-email').or(page.locator('input[type=email]')).first().waitFor()
    // moving between the two forms inside the app, as a visitor does
    await page.goto(`${app.server.url}/sign-in`, { waitUntil: 'networkidle' })
    await page.getByTestId('signin-email').waitFor()
    expect(seen).toEqual([])
    await context.close()
  }, 120_000)
})

/** A fresh browser context in `timezoneId`, signed in as `who`, on `path` of the product. */
async function openAs(who: { email: string; password: string }, path: string, timezoneId?: string): Promise<{ page: Page; close: () => Promise<void> }> {
  const context = await app.browser.newContext({ viewport: { width: 1440, height: 900 }, timezoneId })
  const page = await signInAs(context, app.server.url, who.email, who.password)
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'))
  await page.goto(`${app.server.url}${path}`, { waitUntil: 'networkidle' })
  return { page, close: () => context.close() }
}

describe('one source of words: the same flag and status read the same on every page', () => {
  it('queue, workspace and dashboard name the flag and the status alike; the listener reads "What you hear"; dates are in the browser\'s zone', async () => {
    const { listener, advisor, supervisor, c } = await caseInReview({
      names: { listener: 'Wendeline Quillfeather', advisor: 'Casimir Oyelaran', supervisor: 'Rosalind Achterberg' },
      room: 'square',
      roomName: 'Square den',
      title: 'Quillfeather square den boom',
      description: 'The bass **booms** on the sofa.',
    })
    const inReview = caseStatusLabels.in_review
    // Pacific/Auckland is UTC+13 in December and UTC+12 in June (IANA tz database): never the same wall clock as UTC
    const timezoneId = 'Pacific/Auckland'

    // the advisor's workspace: the flags by name, the status chip, the history's times in the browser's zone
    const { page: wsPage, close: closeWs } = await openAs(advisor, `/desk/cases/${c.id}`, timezoneId)
    await wsPage.getByTestId('flag-item').first().waitFor()
    const flags = await wsPage.getByTestId('flag-item').evaluateAll((items) =>
      items.map((i) => ({ id: i.getAttribute('data-flag')!, name: i.querySelector('[data-testid=flag-name]')?.textContent?.trim() ?? '' })),
    )
    expect(flags.length).toBeGreaterThan(0)
    for (const f of flags) expect(f.name).toBe(flagLabel(f.id))
    expect(flags.map((f) => f.id)).toContain('near-square-plan')
    const square = flagLabel('near-square-plan')
    expect((await wsPage.getByTestId('case-status').first().textContent())?.trim()).toBe(inReview)
    expect(await wsPage.getByTestId('case-description-label').textContent()).toBe(caseAnswerWords.staff.description)
    // one count of the checks: the composer's picker and the analysis tab say the same number, the problems and things worth a look
    const severities = await wsPage.getByTestId('analysis-panel').first().getByTestId('flag-item').evaluateAll((items) =>
      items.map((i) => (['problem', 'warning', 'info'].find((sev) => i.classList.contains(`flag-list__item--${sev}`)) ?? 'info')))
    const toFix = severities.filter((sev) => sev !== 'info').length
    expect((await wsPage.getByTestId('flag-picker').textContent())?.trim()).toBe(`Checks (${toFix})`)
    const tab = (await wsPage.getByTestId('analysis-tab-flags').textContent()) ?? ''
    expect(tab).toMatch(/^\s*Checks/)
    expect(Number(/\d+/.exec(tab)?.[0] ?? '0')).toBe(toFix)
    const times = await wsPage.locator('time[datetime]').evaluateAll((ts) => ts.map((t) => ({ at: t.getAttribute('datetime')!, text: t.textContent!.trim() })))
    expect(times.length).toBeGreaterThan(0)
    for (const t of times) {
      expect(t.text).toBe(formatDateTime(t.at, { timeZone: timezoneId }))
      expect(t.text).not.toBe(formatDateTime(t.at, { timeZone: 'UTC' }))
    }
    await closeWs()

    // the queue: the same status chip, and the same flag name in the row's flag summary
    const { page: qPage, close: closeQ } = await openAs(advisor, '/queue?scope=all&q=Quillfeather', timezoneId)
    const row = qPage.locator(`[data-testid=queue-row][data-case-id="${c.id}"]`)
    await row.waitFor()
    expect((await row.getByTestId('case-status').textContent())?.trim()).toBe(inReview)
    await row.getByTestId('queue-flags').hover()
    await expect.poll(() => qPage.locator('.v-overlay__content').filter({ hasText: square }).count(), { timeout: 15_000 }).toBeGreaterThan(0)
    // the queue's flag filter offers the flag under the same name
    await qPage.getByTestId('queue-flag').click()
    await expect.poll(() => qPage.getByRole('option', { name: square, exact: true }).count(), { timeout: 15_000 }).toBe(1)
    await qPage.keyboard.press('Escape')
    await closeQ()

    // the supervisor's dashboard: the flag and the status tables use the same names
    const { page: dPage, close: closeD } = await openAs(supervisor, '/dashboard', timezoneId)
    const flagsCard = dPage.getByTestId('chart-flags')
    await flagsCard.getByTestId('view-table').click()
    await expect.poll(() => flagsCard.locator('table').textContent(), { timeout: 15_000 }).toContain(square)
    const statusCard = dPage.getByTestId('chart-status')
    await statusCard.getByTestId('view-table').click()
    await expect.poll(() => statusCard.locator('table').textContent(), { timeout: 15_000 }).toContain(inReview)
    await closeD()

    // the listener's own case speaks to them
    const { page: lPage, close: closeL } = await openAs(listener, `/cases/${c.id}`, timezoneId)
    await expect.poll(() => lPage.getByTestId('case-description-label').textContent(), { timeout: 15_000 }).toBe('What you hear and want')
    expect(await lPage.locator('body').textContent()).not.toMatch(/What they hear|What bothers them|What they can't change/)
    expect((await lPage.getByTestId('case-status').first().textContent())?.trim()).toBe(inReview)
    for (const t of await lPage.locator('time[datetime]').evaluateAll((ts) => ts.map((x) => ({ at: x.getAttribute('datetime')!, text: x.textContent!.trim() })))) {
      expect(t.text).toBe(formatDateTime(t.at, { timeZone: timezoneId }))
    }
    await closeL()
  }, 240_000)

  it("an advisor's invitation page speaks of the desk, not the listener's room", async () => {
    const sup = await makeUser('supervisor', 'Ingeborg Valtonen')
    const { token } = await invite(sup, { email: `words-invite-${Date.now()}@example.test`, name: 'Tobiah Nakashima', role: 'advisor' })
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await context.newPage()
    page.setDefaultTimeout(45_000)
    await page.goto(`${app.server.url}/welcome/${token}`, { waitUntil: 'networkidle' })
    await page.getByTestId('set-password-password').waitFor()
    expect(await page.getByTestId('auth-story').getAttribute('data-reader')).toBe('staff')
    expect(await page.getByTestId('auth-story-headline').textContent()).toBe(accountStory.staff.headline)
    expect(await page.getByTestId('auth-story').textContent()).not.toContain(accountStory.listener.headline)
    // the sign-up page keeps the listener's story
    await page.goto(`${app.server.url}/sign-up`, { waitUntil: 'networkidle' })
    await page.getByTestId('signup-email').waitFor()
    expect(await page.getByTestId('auth-story-headline').textContent()).toBe(accountStory.listener.headline)
    await context.close()
  }, 120_000)
})
