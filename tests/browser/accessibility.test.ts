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
import { launchBrowser, signInAs, startProduct } from '../helpers/browser'
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
const DEMO: Record<Role, string> = {
  listener: 'listener@roomwright.test',
  advisor: 'advisor@roomwright.test',
  supervisor: 'supervisor@roomwright.test',
}
const DESKTOP = { width: 1280, height: 900 }
const PHONE = { width: 390, height: 844 }

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
     WHERE u.email = $1 AND c.status = 'plan_sent' ORDER BY p.version DESC LIMIT 1`, [DEMO.listener])
  const [review] = await q<{ id: string }>(`
    SELECT c.id FROM cases c JOIN users u ON u.id = c.assignee_id
     WHERE u.email = $1 AND c.status = 'in_review' ORDER BY c.created_at LIMIT 1`, [DEMO.advisor])
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
  const page = await signInAs(context, server.url, DEMO[who], DEMO_PASSWORD)
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
