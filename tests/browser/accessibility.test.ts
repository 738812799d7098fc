/**
 * Accessibility of every page (issue #16): an automated check with axe-core on each route of the
 * client router, for each role that may open it, at desktop and phone width; the main flows by
 * keyboard alone; and a visible focus ring on what takes focus.
 *
 * The rules axe applies are those of WCAG 2.2 levels A and AA (W3C Recommendation, 5 October 2023),
 * plus Deque's best practices; we fail on the violations axe rates serious or critical.
 * Focus-ring contrast: WCAG 2.2 SC 1.4.11 Non-text Contrast (3:1 against adjacent colours) and
 * SC 2.4.7 Focus Visible; the contrast ratio is WCAG's definition (relative luminance, SC 1.4.3).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { AxeBuilder } from '@axe-core/playwright'
import { randomBytes } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import { DEMO_EMAILS, DESKTOP, PHONE, launchBrowser, signInAs, startProduct } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { db } from '../../server/db/sequelize'
import { seedDemo } from '../../server/seed'
import { DEMO_PASSWORD } from '../../server/seed/people'
import { invite } from '../../server/services/team'
import { buildRoutes, type RouteName } from '../../src/router/routes'
import type { Role } from '../../shared/schemas/auth'
import type { RunningServer } from '../../server/server'

type Who = 'signed-out' | Role
const ROLES: readonly Role[] = ['listener', 'advisor', 'supervisor']

let server: RunningServer
let browser: Browser
const q = <T extends object>(sql: string, bind: unknown[] = []) => db().query<T>(sql, { bind, type: QueryTypes.SELECT })

/** The ids the routes need, taken from the seeded demo scenario so each page shows real content. */
interface Ids {
  listenerCase: string
  planVersion: number
  listenerRoom: string
  reviewCase: string
  invitationToken: string
  resetToken: string
}
let ids: Ids

beforeAll(async () => {
  await seedDemo()
  const [plan] = await q<{ case_id: string; version: number; room_id: string }>(`
    SELECT c.id AS case_id, p.version, c.room_id FROM cases c
      JOIN users u ON u.id = c.listener_id
      JOIN treatment_plans p ON p.case_id = c.id AND p.sent_at IS NOT NULL
     WHERE u.email = $1 AND c.status = 'plan_sent' ORDER BY p.version DESC LIMIT 1`, [DEMO_EMAILS.listener])
  const [review] = await q<{ id: string }>(`
    SELECT c.id FROM cases c JOIN users u ON u.id = c.assignee_id
     WHERE u.email = $1 AND c.status = 'in_review' ORDER BY c.created_at LIMIT 1`, [DEMO_EMAILS.advisor])
  if (!plan || !review) throw new Error('the demo scenario lacks the listener\'s plan_sent case or the advisor\'s case in review')
  const inviter = await makeUser('supervisor', 'Accessibility Inviter')
  const { token } = await invite(inviter, { email: `a11y-${randomBytes(4).toString('hex')}@example.test`, name: 'Noor Vandersteen', role: 'advisor' })
  ids = {
    listenerCase: plan.case_id,
    planVersion: plan.version,
    listenerRoom: plan.room_id,
    reviewCase: review.id,
    invitationToken: token,
    // well-formed, so the page shows its form; the server only judges it when the form is sent
    resetToken: randomBytes(32).toString('base64url'),
  }
  server = await startProduct()
  browser = await launchBrowser()
}, 600_000)
afterAll(async () => {
  await browser?.close()
  await server?.close()
})

/** Where each route is opened. Keyed by every route name, so a new route fails the type check and the coverage test. */
const paths: Record<RouteName, (i: Ids) => string> = {
  home: () => '/',
  'sign-in': () => '/sign-in',
  'sign-up': () => '/sign-up',
  'my-cases': () => '/cases',
  'case-new': () => '/cases/new',
  case: (i) => `/cases/${i.listenerCase}`,
  'measuring-guide': () => '/guide/measuring',
  rooms: () => '/rooms',
  'room-new': () => '/rooms/new',
  'room-edit': (i) => `/rooms/${i.listenerRoom}`,
  dashboard: () => '/dashboard',
  queue: () => '/queue',
  'case-workspace': (i) => `/desk/cases/${i.reviewCase}`,
  'plan-editor': (i) => `/desk/cases/${i.listenerCase}/plan`,
  'plan-report': (i) => `/cases/${i.listenerCase}/plans/${i.planVersion}/report`,
  team: () => '/team',
  'audit-log': () => '/team/audit',
  'set-password': (i) => `/welcome/${i.invitationToken}`,
  'forgot-password': () => '/forgot-password',
  'reset-password': (i) => `/reset-password#token=${i.resetToken}`,
  account: () => '/account',
  mailbox: () => '/mailbox',
  'not-found': () => '/no-such-page-here',
}

/** Who may see each route, read from the router's own meta (as the access matrix reads the API's routes). */
function visitors(): Record<Who, RouteName[]> {
  const out: Record<Who, RouteName[]> = { 'signed-out': [], listener: [], advisor: [], supervisor: [] }
  for (const route of buildRoutes()) {
    const meta = route.meta ?? {}
    const who: Who[] = meta.public ? (meta.guestOnly ? ['signed-out'] : ['signed-out', ...ROLES]) : [...(meta.roles ?? ROLES)]
    for (const w of who) out[w].push(route.name)
  }
  return out
}

/** The path the browser must show once a route has opened (the home route sends each role on). */
function landing(name: RouteName, who: Who, path: string): string {
  if (name === 'home') return who === 'signed-out' ? '/sign-in' : ({ listener: '/cases', advisor: '/queue', supervisor: '/dashboard' } as const)[who]
  return path.split('#')[0]
}

async function contextFor(who: Who, viewport: { width: number; height: number }): Promise<{ context: BrowserContext; page: Page }> {
  const phone = viewport.width < 600
  const context = await browser.newContext({ viewport, isMobile: phone, hasTouch: phone })
  if (who === 'signed-out') {
    const page = await context.newPage()
    page.setDefaultTimeout(45_000)
    return { context, page }
  }
  const page = await signInAs(context, server.url, DEMO_EMAILS[who], DEMO_PASSWORD)
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'), { timeout: 45_000 })
  return { context, page }
}

/** Opens a path and waits until the page has its heading and its data (charts lay out after the data). */
async function open(page: Page, path: string): Promise<void> {
  await page.goto(`${server.url}${path}`, { waitUntil: 'networkidle' })
  await page.locator('h1').first().waitFor({ timeout: 30_000 })
  await page.locator('.v-progress-linear--active, .v-skeleton-loader').first().waitFor({ state: 'detached', timeout: 30_000 }).catch(() => {})
  await page.waitForTimeout(400)
}

/** One readable line per violation: rule, impact, what axe says, and the first elements it found. */
function describeViolations(where: string, violations: Awaited<ReturnType<AxeBuilder['analyze']>>['violations']): string[] {
  return violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => {
      const nodes = v.nodes.slice(0, 4).map((n) => `      ${n.target.join(' ')} — ${(n.failureSummary ?? '').split('\n').slice(1, 2).join('').trim()}`)
      const more = v.nodes.length > 4 ? [`      … and ${v.nodes.length - 4} more`] : []
      return [`${where}: ${v.id} [${v.impact}] ${v.help}`, ...nodes, ...more].join('\n')
    })
}

describe('every route is checked', () => {
  it('the visit list covers every route of the router and every role that may open it', () => {
    const names = buildRoutes().map((r) => r.name)
    expect(names.filter((n) => !(n in paths)), 'routes without a path in accessibility.test.ts').toEqual([])
    expect(Object.keys(paths).filter((n) => !names.includes(n as RouteName)), 'paths for routes that no longer exist').toEqual([])
    const v = visitors()
    // each signed-in role has pages of its own, and the signed-out visitor the public ones
    expect(v['signed-out']).toEqual(expect.arrayContaining(['sign-in', 'sign-up', 'forgot-password', 'reset-password', 'set-password', 'not-found']))
    expect(v.listener).toEqual(expect.arrayContaining(['my-cases', 'case', 'room-edit', 'plan-report']))
    expect(v.advisor).toEqual(expect.arrayContaining(['queue', 'case-workspace', 'plan-editor']))
    expect(v.supervisor).toEqual(expect.arrayContaining(['dashboard', 'team', 'mailbox', 'audit-log']))
  })
})

describe.each([
  ['desktop', DESKTOP],
  ['390 px phone', PHONE],
] as const)('axe-core finds no serious or critical violation (%s)', (label, viewport) => {
  it.each(['signed-out', ...ROLES] as Who[])('on every page a %s visitor may open', async (who) => {
    const { context, page } = await contextFor(who, viewport)
    const problems: string[] = []
    const visited: RouteName[] = []
    for (const name of visitors()[who]) {
      const path = paths[name](ids)
      await open(page, path)
      const shown = new URL(page.url()).pathname
      expect(shown, `${name} as ${who} opened ${path} but the browser shows ${shown}`).toBe(landing(name, who, path))
      const result = await new AxeBuilder({ page })
        .withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa', 'best-practice'])
        .analyze()
      problems.push(...describeViolations(`${name} (${path.replace(/[0-9a-f-]{36}|[A-Za-z0-9_-]{43}/g, ':id')}, ${who}, ${label})`, result.violations))
      visited.push(name)
    }
    await context.close()
    expect(visited).toEqual(visitors()[who])
    expect(problems.join('\n'), 'axe-core violations').toBe('')
  }, 900_000)
})

/** What has focus, in words, for failure messages. */
const focused = (page: Page) =>
  page.evaluate(() => {
    const a = document.activeElement as HTMLElement | null
    if (!a || a === document.body) return 'nothing (the page body)'
    const id = a.closest('[data-testid]')?.getAttribute('data-testid')
    return `<${a.tagName.toLowerCase()}${a.getAttribute('role') ? ` role=${a.getAttribute('role')}` : ''}> "${(a.getAttribute('aria-label') ?? a.textContent ?? '').trim().slice(0, 60)}" in [${id ?? ''}]`
  })

const focusMatches = (page: Page, selector: string) => page.evaluate((s) => !!document.activeElement?.matches(s), selector)

/** Presses Tab (or Shift+Tab) until the focused element matches `selector`; fails after `max` presses. */
async function tabTo(page: Page, selector: string, max = 150, key: 'Tab' | 'Shift+Tab' = 'Tab'): Promise<number> {
  for (let i = 1; i <= max; i++) {
    await page.keyboard.press(key)
    if (await focusMatches(page, selector)) return i
  }
  throw new Error(`${max} presses of ${key} never reached ${selector}; focus is on ${await focused(page)}`)
}

describe('the main flows work with the keyboard alone', () => {
  it('signing in: the e-mail field has focus, Tab goes to the password, Enter signs in', async () => {
    const context = await browser.newContext({ viewport: DESKTOP })
    const page = await context.newPage()
    await page.goto(`${server.url}/sign-in`, { waitUntil: 'networkidle' })
    expect(await focusMatches(page, '[data-testid="signin-email"] input'), `focus is on ${await focused(page)}`).toBe(true)
    await page.keyboard.type(DEMO_EMAILS.listener)
    await page.keyboard.press('Tab')
    expect(await focusMatches(page, '[data-testid="signin-password"] input'), `focus is on ${await focused(page)}`).toBe(true)
    await page.keyboard.type(DEMO_PASSWORD)
    await page.keyboard.press('Enter')
    await page.waitForURL(/\/cases$/, { timeout: 45_000 })
    await context.close()
  })

  it('a skip link comes first and moves focus past the navigation to the page', async () => {
    const { context, page } = await contextFor('listener', DESKTOP)
    await open(page, '/cases')
    await page.keyboard.press('Tab')
    expect(await focusMatches(page, '[data-testid="skip-link"]'), `focus is on ${await focused(page)}`).toBe(true)
    const box = await page.getByTestId('skip-link').boundingBox()
    expect(box && box.y >= 0 && box.height > 10, 'the focused skip link is on screen').toBe(true)
    await page.keyboard.press('Enter')
    expect(await focusMatches(page, 'main#content'), `focus is on ${await focused(page)}`).toBe(true)
    // the next Tab lands inside the page, not back in the navigation
    await page.keyboard.press('Tab')
    expect(await page.evaluate(() => !!document.activeElement?.closest('main')), `focus is on ${await focused(page)}`).toBe(true)
    await context.close()
  })

  it('a listener opens a case and then a room', async () => {
    const { context, page } = await contextFor('listener', DESKTOP)
    await open(page, '/cases')
    // the list of cases is one tab stop (Vuetify's list keyboard model): the arrow keys move within it
    await tabTo(page, '[data-testid="my-case"]')
    const wanted = `[data-testid="my-case"][href="/cases/${ids.listenerCase}"]`
    for (let i = 0; i < 20 && !(await focusMatches(page, wanted)); i++) await page.keyboard.press('ArrowDown')
    expect(await focusMatches(page, wanted), `focus is on ${await focused(page)}`).toBe(true)
    await page.keyboard.press('Enter')
    await page.waitForURL(new RegExp(`/cases/${ids.listenerCase}$`))
    await page.getByTestId('plan-for-listener').waitFor()

    await tabTo(page, '[data-testid="nav-rooms"]', 150, 'Shift+Tab')
    await page.keyboard.press('Enter')
    await page.waitForURL(/\/rooms$/)
    await tabTo(page, '[data-testid="rooms-item"]')
    await page.keyboard.press('Enter')
    await page.waitForURL(/\/rooms\/[0-9a-f-]{36}$/)
    await page.locator('h1').first().waitFor()
    await context.close()
  })

  it('an advisor opens the queue, a case, writes a reply and sends it', async () => {
    const { context, page } = await contextFor('advisor', DESKTOP)
    await open(page, '/team') // not theirs: sent on to their home, the queue
    expect(new URL(page.url()).pathname).toBe('/queue')
    await tabTo(page, '[data-testid="queue-row"] a')
    // the row shows that it has focus (see the focus tests below), and Enter opens the case
    const href = await page.evaluate(() => (document.activeElement as HTMLAnchorElement).getAttribute('href'))
    await page.keyboard.press('Enter')
    await page.waitForURL((u) => u.pathname === href)
    await page.getByTestId('composer-input').waitFor()
    await tabTo(page, '[data-testid="composer-input"] textarea')
    const reply = `Thanks, by keyboard only ${randomBytes(3).toString('hex')}: try the corner traps first.`
    await page.keyboard.type(reply)
    await tabTo(page, '[data-testid="composer-send"]', 20)
    await page.keyboard.press('Enter')
    await expect.poll(() => page.getByTestId('thread-message').filter({ hasText: reply }).count(), { timeout: 30_000 }).toBe(1)
    await context.close()
  })

  it('a dialog holds focus while open, Escape closes it and focus returns to the button that opened it', async () => {
    const { context, page } = await contextFor('advisor', DESKTOP)
    await open(page, '/queue')
    await tabTo(page, '[data-testid="save-filter"]')
    await page.keyboard.press('Enter')
    await page.getByTestId('save-filter-name').waitFor()
    await expect.poll(() => focusMatches(page, '[data-testid="save-filter-name"] input')).toBe(true)
    for (const key of ['Tab', 'Tab', 'Tab', 'Tab', 'Tab', 'Shift+Tab', 'Shift+Tab', 'Shift+Tab', 'Shift+Tab', 'Shift+Tab', 'Shift+Tab']) {
      await page.keyboard.press(key)
      expect(await page.evaluate(() => !!document.activeElement?.closest('.v-overlay--active')), `after ${key} focus is on ${await focused(page)}`).toBe(true)
    }
    await page.keyboard.press('Escape')
    await page.getByTestId('save-filter-name').waitFor({ state: 'hidden' })
    await expect.poll(() => focusMatches(page, '[data-testid="save-filter"]')).toBe(true)

    // the account menu: Enter opens it, the arrow keys reach its items, Escape closes it back onto its button
    await tabTo(page, '[data-testid="nav-user-menu"]', 150, 'Shift+Tab')
    await page.keyboard.press('Enter')
    await page.getByTestId('nav-account').waitFor()
    await page.keyboard.press('ArrowDown')
    await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('role'))).toBe('menuitem')
    await page.keyboard.press('Escape')
    await expect.poll(() => focusMatches(page, '[data-testid="nav-user-menu"]')).toBe(true)
    await context.close()
  })

  it('a supervisor opens the dashboard and switches a chart to its table with the Space bar', async () => {
    const { context, page } = await contextFor('supervisor', DESKTOP)
    await open(page, '/team')
    await tabTo(page, '[data-testid="nav-dashboard"]', 150, 'Shift+Tab')
    await page.keyboard.press('Enter')
    await page.waitForURL(/\/dashboard$/)
    await page.getByTestId('dashboard-kpis').waitFor()
    await tabTo(page, '[data-testid="chart-status"] [data-testid="view-table"]')
    await page.keyboard.press('Space')
    await expect.poll(() => page.getByTestId('chart-status').locator('table').count()).toBe(1)
    // focus stays on the toggle, which now offers the chart back
    expect(await focusMatches(page, '[data-testid="chart-status"] [data-testid="view-chart"]'), `focus is on ${await focused(page)}`).toBe(true)
    await context.close()
  })
})

/**
 * The focus ring of the focused element, read from computed styles: its width and colour and the
 * colour behind it. For a field the ring is drawn round the whole field; for a clickable row, on its cells.
 */
async function focusRing(page: Page): Promise<{ what: string; width: number; ring: string; behind: string; contrast: number }> {
  return page.evaluate(() => {
    const parse = (c: string): [number, number, number, number] | null => {
      const m = /rgba?\(([\d.]+),?\s*([\d.]+),?\s*([\d.]+)(?:[,/]\s*([\d.]+))?\)/.exec(c)
      return m ? [Number(m[1]), Number(m[2]), Number(m[3]), m[4] === undefined ? 1 : Number(m[4])] : null
    }
    // relative luminance and contrast ratio as WCAG 2.2 defines them (SC 1.4.3, "contrast ratio")
    const lum = ([r, g, b]: number[]) => {
      const f = (v: number) => ((v /= 255) <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4)
      return 0.2126 * f(r) + 0.7152 * f(g) + 0.0722 * f(b)
    }
    const ratio = (a: number[], b: number[]) => {
      const [x, y] = [lum(a), lum(b)].sort((p, q) => q - p)
      return (x + 0.05) / (y + 0.05)
    }
    const a = document.activeElement as HTMLElement
    const field = a.closest<HTMLElement>('.v-field')
    const row = a.closest('tr')
    let target: HTMLElement = field ?? a
    let width = 0
    let ring = ''
    const own = getComputedStyle(target)
    if (own.outlineStyle !== 'none' && parseFloat(own.outlineWidth) > 0) {
      width = parseFloat(own.outlineWidth)
      ring = own.outlineColor
    } else if (row) {
      target = row.querySelector('td') ?? row
      const shadow = getComputedStyle(target).boxShadow
      const m = /(rgba?\([^)]+\))[^,]*?(\d+(?:\.\d+)?)px\s+0px\s+0px|(rgba?\([^)]+\))\s+0px\s+(\d+(?:\.\d+)?)px/.exec(shadow)
      if (shadow !== 'none' && m) {
        ring = m[1] ?? m[3]
        width = Number(m[2] ?? m[4])
      }
    }
    let behind = 'rgb(255, 255, 255)'
    for (let el: HTMLElement | null = target.parentElement; el; el = el.parentElement) {
      const bg = parse(getComputedStyle(el).backgroundColor)
      if (bg && bg[3] > 0.5) {
        behind = getComputedStyle(el).backgroundColor
        break
      }
    }
    const r = parse(ring)
    const what = `<${a.tagName.toLowerCase()}> [${a.closest('[data-testid]')?.getAttribute('data-testid') ?? ''}]`
    return { what, width, ring, behind, contrast: r && r[3] > 0.5 ? ratio(r, parse(behind)!) : 0 }
  })
}

describe('what has keyboard focus shows a visible ring of sufficient contrast', () => {
  const expectRing = async (page: Page, kind: string) => {
    const r = await focusRing(page)
    expect(r.width, `${kind} ${r.what}: ring width`).toBeGreaterThanOrEqual(2)
    expect(r.contrast, `${kind} ${r.what}: ring ${r.ring} against ${r.behind}`).toBeGreaterThanOrEqual(3)
  }

  it('on links and fields of the sign-in page', async () => {
    const context = await browser.newContext({ viewport: DESKTOP })
    const page = await context.newPage()
    await open(page, '/sign-in')
    await tabTo(page, '[data-testid="signin-email"] input', 10, 'Shift+Tab').catch(() => tabTo(page, '[data-testid="signin-email"] input', 10))
    await expectRing(page, 'field')
    await tabTo(page, '[data-testid="signin-forgot"]', 10)
    await expectRing(page, 'link')
    await tabTo(page, '[data-testid="signin-submit"]', 10)
    await expectRing(page, 'button')
    await context.close()
  })

  /** On `path`, tabs to each stop in turn and checks the ring on it; then closes the context. */
  const ringsAlong = async ({ context, page }: { context: BrowserContext; page: Page }, path: string, stops: [selector: string, kind: string][]) => {
    await open(page, path)
    for (const [selector, kind] of stops) {
      await tabTo(page, selector)
      await expectRing(page, kind)
    }
    await context.close()
  }

  it('on the queue: a button, the search field, a clickable row, the navigation', async () => {
    await ringsAlong(await contextFor('advisor', DESKTOP), '/queue', [
      ['[data-testid="nav-queue"]', 'navigation link'],
      ['[data-testid="queue-search"] input', 'field'],
      ['[data-testid="queue-row"] a', 'clickable table row'],
      ['[data-testid="claim-button"], [data-testid="queue-row"] button', 'button'],
    ])
  })

  it('on the dashboard: the chart toggles and the download buttons', async () => {
    await ringsAlong(await contextFor('supervisor', DESKTOP), '/dashboard', [
      ['[data-testid="view-table"]', 'chart toggle'],
      ['[data-testid="download-csv"]', 'button'],
    ])
  })

  it('in the dark theme too', async () => {
    const opened = await contextFor('advisor', DESKTOP)
    await opened.page.emulateMedia({ colorScheme: 'dark' }) // no saved choice: the system's dark preference applies
    await ringsAlong(opened, '/queue', [
      ['[data-testid="queue-row"] a', 'clickable table row (dark)'],
      ['[data-testid="claim-button"], [data-testid="queue-row"] button', 'button (dark)'],
    ])
  })
})
