/**
 * Accessibility of what opens over a page (issue #16): axe-core with each menu and dialog open — the
 * composer's check and snippet menus, "keep as snippet", hand-over and its list, the dashboard's
 * reassign list, the account menu, the photo viewer — in the light and the dark theme; focus back on
 * the opening control when "keep as snippet" and the photo viewer close; and the main pages of each
 * role checked again in the dark theme.
 *
 * Rules: WCAG 2.2 levels A and AA (W3C Recommendation, 5 October 2023) and Deque's best practices, as
 * axe-core applies them; we fail on serious or critical violations. Focus return: WAI-ARIA Authoring
 * Practices 1.2, Dialog (Modal) pattern ("when a dialog closes, focus returns to the element that
 * invoked it").
 */
import { describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import { AxeBuilder } from '@axe-core/playwright'
import { join } from 'node:path'
import { QueryTypes } from 'sequelize'
import { DEMO_EMAILS, DESKTOP, PHONE, screenshotDir, signInAs, useProduct } from '../helpers/browser'
import { sessionFor } from '../helpers/sockets'
import { jpeg } from '../unit/uploads/make-files'
import { db } from '../../server/db/sequelize'
import { seedDemo } from '../../server/seed'
import { DEMO_PASSWORD } from '../../server/seed/people'
import type { Role } from '../../shared/schemas/auth'

type Theme = 'light' | 'dark'
/** The theme names of src/plugins/vuetify.ts (not imported: that module loads Vuetify's CSS). */
const themeNames = { light: 'roomwright', dark: 'roomwrightDark' } as const

const ids = { listenerCase: '', reviewCase: '', listenerRoom: '' }
const app = useProduct({
  timeout: 600_000,
  before: async () => {
    await seedDemo()
    const q = <T extends object>(sql: string, bind: unknown[]) => db().query<T>(sql, { bind, type: QueryTypes.SELECT })
    const [plan] = await q<{ id: string; room_id: string }>(
      `SELECT c.id, c.room_id FROM cases c JOIN users u ON u.id = c.listener_id WHERE u.email = $1 AND c.status = 'plan_sent' ORDER BY c.created_at LIMIT 1`,
      [DEMO_EMAILS.listener],
    )
    const [review] = await q<{ id: string }>(
      `SELECT c.id FROM cases c JOIN users u ON u.id = c.assignee_id WHERE u.email = $1 AND c.status = 'in_review' ORDER BY c.created_at LIMIT 1`,
      [DEMO_EMAILS.advisor],
    )
    if (!plan || !review) throw new Error("the demo scenario lacks the listener's plan_sent case or the advisor's case in review")
    Object.assign(ids, { listenerCase: plan.id, listenerRoom: plan.room_id, reviewCase: review.id })
  },
})

async function contextFor(role: Role, theme: Theme, viewport = DESKTOP): Promise<{ context: BrowserContext; page: Page }> {
  const phone = viewport.width < 600
  const context = await app.browser.newContext({ viewport, isMobile: phone, hasTouch: phone })
  // the saved choice of the account menu's theme switch (useThemePreference), written before the first page
  // only: on every load it would undo a choice made with the switch, as a reload in the test below would show
  await context.addInitScript((name) => localStorage.getItem('roomwright.theme') ?? localStorage.setItem('roomwright.theme', name), themeNames[theme])
  const page = await signInAs(context, app.server.url, DEMO_EMAILS[role], DEMO_PASSWORD)
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'), { timeout: 45_000 })
  return { context, page }
}

async function open(page: Page, path: string): Promise<void> {
  await page.goto(`${app.server.url}${path}`, { waitUntil: 'networkidle' })
  await page.locator('h1').first().waitFor({ timeout: 30_000 })
  await page.locator('.v-progress-linear--active, .v-skeleton-loader').first().waitFor({ state: 'detached', timeout: 30_000 }).catch(() => {})
  await page.waitForTimeout(300)
}

/** Serious and critical violations, one readable line each (rule, impact, first elements). */
async function axe(page: Page, where: string): Promise<string[]> {
  const { violations } = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa', 'best-practice']).analyze()
  return violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => [`${where}: ${v.id} [${v.impact}] ${v.help}`, ...v.nodes.slice(0, 4).map((n) => `      ${n.target.join(' ')} — ${(n.failureSummary ?? '').split('\n').slice(1, 2).join('').trim()}`)].join('\n'))
}

/** The open overlay's content (menus and dialogs of Vuetify), once it has finished appearing. */
const overlay = (page: Page) => page.locator('.v-overlay--active .v-overlay__content').last()
async function settled(page: Page): Promise<void> {
  await overlay(page).waitFor()
  await page.waitForTimeout(350) // the open transition, so axe reads final colours
}
async function closeOverlay(page: Page): Promise<void> {
  await page.keyboard.press('Escape')
  await expect.poll(() => page.locator('.v-overlay--active').count(), { timeout: 10_000 }).toBe(0)
}

const isFocused = (page: Page, testid: string) =>
  page.evaluate((t) => !!document.activeElement?.closest(`[data-testid="${t}"]`), testid)

describe.each(['light', 'dark'] as const)('axe-core with menus and dialogs open (%s theme)', (theme) => {
  it("the advisor's workspace: check menu, snippet menu, keep-as-snippet dialog, hand-over dialog and its list; the account menu", async () => {
    const { context, page } = await contextFor('advisor', theme)
    await open(page, `/desk/cases/${ids.reviewCase}`)
    expect(await page.evaluate(() => document.querySelector('.v-application')?.className)).toContain(theme === 'dark' ? themeNames.dark : themeNames.light)
    const problems: string[] = []

    await page.getByTestId('flag-picker').click()
    await settled(page)
    expect(await overlay(page).locator('[data-testid^="flag-insert-"]').count()).toBeGreaterThan(0)
    problems.push(...(await axe(page, 'check menu')))
    await page.screenshot({ path: join(screenshotDir(), `overlay-flag-menu-${theme}.png`) })
    await closeOverlay(page)

    await page.getByTestId('composer-input').locator('textarea').first().fill('Try the sofa 40 cm from the back wall first; it often calms the 45 Hz boom.')
    await page.getByTestId('snippet-picker').click()
    await settled(page)
    problems.push(...(await axe(page, 'snippet menu')))
    await page.screenshot({ path: join(screenshotDir(), `overlay-snippet-menu-${theme}.png`) })
    await page.getByTestId('snippet-save').click()
    await page.getByTestId('snippet-title').waitFor()
    await settled(page)
    problems.push(...(await axe(page, 'keep-as-snippet dialog')))
    await page.screenshot({ path: join(screenshotDir(), `overlay-keep-snippet-${theme}.png`) })
    await closeOverlay(page)

    await page.getByTestId('handover-button').click()
    await page.getByTestId('handover-target').waitFor()
    await settled(page)
    problems.push(...(await axe(page, 'hand-over dialog')))
    await page.getByTestId('handover-target').click()
    await page.getByRole('option').first().waitFor()
    await page.waitForTimeout(350)
    problems.push(...(await axe(page, 'hand-over dialog with its list open')))
    await page.screenshot({ path: join(screenshotDir(), `overlay-handover-list-${theme}.png`) })
    // Escape closes the list first; only once it has gone is the dialog the top overlay that the next Escape closes
    await page.keyboard.press('Escape')
    await page.getByRole('option').first().waitFor({ state: 'hidden' })
    await expect.poll(() => page.locator('.v-overlay--active').count(), { timeout: 10_000 }).toBe(1)
    await closeOverlay(page)

    await page.getByTestId('nav-user-menu').click()
    await page.getByTestId('nav-account').waitFor()
    await settled(page)
    problems.push(...(await axe(page, 'account menu')))
    await closeOverlay(page)
    await context.close()
    expect(problems.join('\n'), 'axe-core violations').toBe('')
  }, 300_000)

  it("the supervisor's dashboard with a reassign list open, and the listener's photo viewer", async () => {
    const problems: string[] = []
    const sup = await contextFor('supervisor', theme)
    await open(sup.page, '/dashboard')
    const reassign = sup.page.getByTestId('reassign-select').first()
    await reassign.waitFor()
    await reassign.click()
    await sup.page.getByRole('option').first().waitFor()
    await sup.page.waitForTimeout(350)
    problems.push(...(await axe(sup.page, 'dashboard reassign list')))
    await sup.page.screenshot({ path: join(screenshotDir(), `overlay-reassign-${theme}.png`) })
    await sup.context.close()

    await addPhoto()
    const { context, page } = await contextFor('listener', theme)
    await open(page, `/cases/${ids.listenerCase}`)
    await page.getByTestId('photo-thumb').first().click()
    await page.getByTestId('photo-viewer').waitFor()
    await page.waitForTimeout(350)
    problems.push(...(await axe(page, 'photo viewer')))
    await page.screenshot({ path: join(screenshotDir(), `overlay-photo-viewer-${theme}.png`) })
    await context.close()
    expect(problems.join('\n'), 'axe-core violations').toBe('')
  }, 300_000)
})

let photoAdded = false
/** A photo on the listener's demo case (the demo scenario has none), added once over HTTP. */
async function addPhoto(): Promise<void> {
  if (photoAdded) return
  const l = await sessionFor(app.server.url, DEMO_EMAILS.listener, DEMO_PASSWORD)
  await l.agent.post(`/api/cases/${ids.listenerCase}/files`).set('X-CSRF-Token', l.csrf).attach('file', await jpeg(900, 600), 'front-wall-from-the-sofa.jpg').expect(201)
  photoAdded = true
}

describe('focus goes back to the control that opened the dialog', () => {
  it('"Keep as snippet" (opened from the snippet menu): Escape and Cancel both return focus to the Snippets button', async () => {
    const { context, page } = await contextFor('advisor', 'light')
    await open(page, `/desk/cases/${ids.reviewCase}`)
    await page.getByTestId('composer-input').locator('textarea').first().fill('Measure again after the rug is down, from the same spot.')
    for (const how of ['Escape', 'Cancel'] as const) {
      await page.getByTestId('snippet-picker').click()
      await page.getByTestId('snippet-save').click()
      await page.getByTestId('snippet-title').waitFor()
      await expect.poll(() => isFocused(page, 'snippet-title')).toBe(true)
      if (how === 'Escape') await page.keyboard.press('Escape')
      else await overlay(page).getByRole('button', { name: 'Cancel' }).click()
      await page.getByTestId('snippet-title').waitFor({ state: 'hidden' })
      await expect.poll(() => isFocused(page, 'snippet-picker'), { message: `after ${how}` }).toBe(true)
    }
    // by keyboard alone too: Enter opens the menu, the arrows reach "keep…", Enter opens the dialog, Escape returns
    await page.getByTestId('snippet-picker').focus()
    await page.keyboard.press('Enter')
    await page.getByTestId('snippet-save').waitFor()
    await page.getByTestId('snippet-save').focus()
    await page.keyboard.press('Enter')
    await page.getByTestId('snippet-title').waitFor()
    await page.keyboard.press('Escape')
    await page.getByTestId('snippet-title').waitFor({ state: 'hidden' })
    await expect.poll(() => isFocused(page, 'snippet-picker'), { message: 'after the keyboard round' }).toBe(true)
    await context.close()
  }, 120_000)

  it('the photo viewer: Escape and the close button both return focus to the photo that was opened', async () => {
    await addPhoto()
    const { context, page } = await contextFor('listener', 'light', PHONE)
    await open(page, `/cases/${ids.listenerCase}`)
    const thumb = page.getByTestId('photo-thumb').first()
    for (const how of ['Escape', 'close button'] as const) {
      await thumb.click()
      await page.getByTestId('photo-viewer').waitFor()
      if (how === 'Escape') await page.keyboard.press('Escape')
      else await page.getByTestId('photo-close').click()
      await page.getByTestId('photo-viewer').waitFor({ state: 'hidden' })
      await expect.poll(() => isFocused(page, 'photo-thumb'), { message: `after ${how}` }).toBe(true)
    }
    await context.close()
  }, 120_000)
})

describe('the dark theme', () => {
  it("the account menu's switch turns it on, and it stays on after a reload", async () => {
    const { context, page } = await contextFor('listener', 'light')
    await open(page, '/cases')
    const themed = () => page.evaluate(() => document.querySelector('.v-application')?.className ?? '')
    expect(await themed()).toContain(`v-theme--${themeNames.light}`)
    await page.getByTestId('nav-user-menu').click()
    await page.getByTestId('nav-theme').click()
    await expect.poll(themed).toContain(`v-theme--${themeNames.dark}`)
    await page.reload({ waitUntil: 'networkidle' })
    await expect.poll(themed).toContain(`v-theme--${themeNames.dark}`)
    await context.close()
  }, 60_000)

  const main: Record<Role | 'signed-out', (() => string)[]> = {
    'signed-out': [() => '/sign-in', () => '/sign-up'],
    listener: [() => '/cases', () => `/cases/${ids.listenerCase}`, () => `/rooms/${ids.listenerRoom}`],
    advisor: [() => '/queue', () => `/desk/cases/${ids.reviewCase}`, () => `/desk/cases/${ids.listenerCase}/plan`],
    supervisor: [() => '/dashboard', () => '/team', () => '/account'],
  }
  describe.each([
    ['desktop', DESKTOP],
    ['390 px phone', PHONE],
  ] as const)('axe-core finds no serious or critical violation on the main pages (%s)', (label, viewport) => {
    it.each(Object.keys(main) as (Role | 'signed-out')[])('of a %s visitor', async (who) => {
      let context: BrowserContext
      let page: Page
      if (who === 'signed-out') {
        context = await app.browser.newContext({ viewport, colorScheme: 'dark', isMobile: viewport.width < 600 })
        page = await context.newPage() // no saved choice: the system's dark preference applies
      } else ({ context, page } = await contextFor(who, 'dark', viewport))
      const problems: string[] = []
      for (const path of main[who]) {
        await open(page, path())
        expect(await page.evaluate(() => document.querySelector('.v-application')?.className)).toContain(`v-theme--${themeNames.dark}`)
        problems.push(...(await axe(page, `${path().replace(/[0-9a-f-]{36}/g, ':id')} (${who}, dark, ${label})`)))
        if (label === 'desktop' || path() === main[who][0]()) {
          await page.screenshot({ path: join(screenshotDir(), `dark-${who}-${path().split('/').filter(Boolean).slice(0, 2).join('-').replace(/[0-9a-f-]{36}/, 'id') || 'home'}-${viewport.width}.png`), fullPage: true })
        }
      }
      await context.close()
      expect(problems.join('\n'), 'axe-core violations').toBe('')
    }, 300_000)
  })
})
