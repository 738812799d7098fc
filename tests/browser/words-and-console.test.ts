import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { signInAs, useProduct } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { createRoom } from '../../server/services/rooms'
import { createCase, updateCase } from '../../server/services/cases'
import { demoRooms } from '../../server/seed/rooms'
import { roomSchema } from '../../shared/schemas/room'

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
    }
    await page.getByTestId('signin-email').or(page.locator('input[type=email]')).first().waitFor()
    // moving between the two forms inside the app, as a visitor does
    await page.goto(`${app.server.url}/sign-in`, { waitUntil: 'networkidle' })
    await page.getByTestId('signin-email').waitFor()
    expect(seen).toEqual([])
    await context.close()
  }, 120_000)
})
