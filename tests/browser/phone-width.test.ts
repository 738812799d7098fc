import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { PHONE, signInAs, useProduct } from '../helpers/browser'
import { caseInReview } from '../helpers/service-cases'
import { createPlan } from '../../server/services/plans'
import { demoPlanBody } from '../../server/seed/demo-plan'

const app = useProduct({ timeout: 120_000 })

/** The page's width and, when it is too wide, the widest elements (to say what pushes it out). */
async function width(page: Page): Promise<{ scrollWidth: number; culprits: string[] }> {
  return page.evaluate((limit) => {
    const culprits: string[] = []
    // the outermost elements that stick out of a parent that itself fits: what pushes the page out
    for (const el of Array.from(document.querySelectorAll<HTMLElement>('main *'))) {
      const r = el.getBoundingClientRect()
      const parent = el.parentElement?.getBoundingClientRect()
      if (r.right > limit + 1 && parent && parent.right <= limit + 1 && culprits.length < 8) {
        culprits.push(`${el.tagName.toLowerCase()}.${[...el.classList].slice(0, 3).join('.')}[${el.dataset.testid ?? ''}] right=${Math.round(r.right)}`)
      }
    }
    return { scrollWidth: document.documentElement.scrollWidth, culprits }
  }, PHONE.width)
}

describe('on a 390 px phone no page scrolls sideways', () => {
  it('every page of every role fits the screen: sign-in, cases, rooms, queue, workspace, plan editor and report, dashboard, team, audit, mailbox, account', async () => {
    const { listener, advisor, supervisor, room, c } = await caseInReview({
      names: { listener: 'Philippa Ahenkorah', advisor: 'Tobiah Marchetti', supervisor: 'Gwendolyn Osei' },
      room: 'smallStudio',
      roomName: 'Spare bedroom studio',
      title: 'Narrow screen case',
      description: 'The bass **booms** at the desk.',
      assign: true,
    })
    await createPlan(advisor, c.id, demoPlanBody(room.room, 'Corner traps first.'))

    const visits: Array<[typeof listener | null, string[]]> = [
      [null, ['/sign-in', '/sign-up', '/forgot-password', '/no-such-page']],
      [listener, [`/cases/${c.id}`, `/rooms/${room.id}`, '/cases', '/cases/new', '/rooms', '/rooms/new', '/guide/measuring', '/account']],
      [advisor, ['/queue', `/desk/cases/${c.id}`, `/desk/cases/${c.id}/plan`, `/cases/${c.id}/plans/1/report`, '/account']],
      [supervisor, ['/dashboard', '/team', '/team/audit', '/mailbox', '/queue']],
    ]
    const wide: Record<string, unknown> = {}
    for (const [who, paths] of visits) {
      const context = await app.browser.newContext({ viewport: PHONE, isMobile: true, hasTouch: true })
      const page = who ? await signInAs(context, app.server.url, who.email, who.password) : await context.newPage()
      if (who) await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'))
      for (const path of paths) {
        await page.goto(`${app.server.url}${path}`, { waitUntil: 'networkidle' })
        await page.locator('main').first().waitFor()
        // the page asked for, not a redirect or the not-found page (which would fit trivially)
        expect(new URL(page.url()).pathname, path).toBe(path)
        if (path !== '/no-such-page') expect(await page.getByText('There is nothing at this address').count(), path).toBe(0)
        if (path.endsWith('/report')) await page.getByTestId('plan-steps').waitFor()
        await page.waitForTimeout(1500) // charts and drawings lay out after the data arrives
        const w = await width(page)
        if (w.scrollWidth > PHONE.width) wide[path.replace(c.id, ':case').replace(room.id, ':room')] = w
      }
      await context.close()
    }
    expect(wide).toEqual({})
  }, 300_000)
})
