import { describe, expect, it } from 'vitest'
import { join } from 'node:path'
import { QueryTypes } from 'sequelize'
import { screenshotDir, signInAs, useProduct } from '../helpers/browser'
import { makeUser, uniqueEmail } from '../helpers/api'
import { db } from '../../server/db/sequelize'

const app = useProduct()

async function invitationToken(email: string): Promise<string> {
  for (let i = 0; i < 50; i++) {
    const rows = await db().query<{ text: string }>(`SELECT text FROM email_outbox WHERE to_address = $1 AND kind = 'invitation' ORDER BY created_at DESC LIMIT 1`, {
      bind: [email], type: QueryTypes.SELECT,
    })
    const m = /\/welcome\/([A-Za-z0-9_-]{43})/.exec(rows[0]?.text ?? '')
    if (m) return m[1]
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error(`no invitation e-mail to ${email}`)
}

describe('the supervisor manages the team in the browser', () => {
  it('the dashboard shows its figures (screenshot saved)', async () => {
    // For a screenshot worth looking at (a manual run): KEEP_SCREENSHOTS_IN=/some/dir adds invented history first and copies the picture there.
    const keep = process.env.KEEP_SCREENSHOTS_IN
    if (keep) await (await import('../../server/seed/steps/0003-history')).insertHistory({ cases: 300, weeks: 12, listeners: 40, tag: `browser-${Date.now()}` })
    const sup = await makeUser('supervisor', 'Browser Supervisor Imke')
    const context = await app.browser.newContext({ viewport: { width: 1440, height: 900 } })
    const page = await signInAs(context, app.server.url, sup.email, sup.password)
    await page.waitForURL(/\/dashboard$/)
    await page.getByTestId('dashboard-kpis').waitFor({ timeout: 15_000 })
    await page.getByTestId('breach-list').waitFor()
    await page.waitForTimeout(500)
    await page.screenshot({ path: join(screenshotDir(), 'dashboard.png'), fullPage: true })
    if (keep) await page.screenshot({ path: join(keep, 'dashboard.png'), fullPage: true })
    const status = page.getByTestId('chart-status')
    await status.getByTestId('view-table').click()
    await expect.poll(() => status.locator('table').textContent()).toMatch(/In review/)
    const [download] = await Promise.all([page.waitForEvent('download'), status.getByTestId('download-csv').click()])
    expect(download.suggestedFilename()).toBe('open-cases-by-status.csv')
    await context.close()
  })

  it('invites an advisor, who sets a password from the link and lands on the queue; the link then refuses', async () => {
    const sup = await makeUser('supervisor', 'Browser Supervisor Joost')
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await signInAs(context, app.server.url, sup.email, sup.password)
    await page.waitForURL(/\/dashboard$/)
    await page.goto(`${app.server.url}/team`)
    const email = uniqueEmail('browser-invitee')
    await page.getByTestId('open-invite').click()
    await page.getByTestId('invite-name').locator('input').fill('Saskia Oyelaran')
    await page.getByTestId('invite-email').locator('input').fill(email)
    await page.getByTestId('invite-send').click()
    await page.getByTestId(`invitation-${email}`).waitFor()
    await page.screenshot({ path: join(screenshotDir(), 'team.png'), fullPage: true })

    const token = await invitationToken(email)
    const invitee = await app.browser.newContext()
    const welcome = await invitee.newPage()
    await welcome.goto(`${app.server.url}/welcome/${token}`)
    await expect.poll(() => welcome.getByTestId('page-title').textContent()).toMatch(/Join/)
    await welcome.getByTestId('set-password-password').locator('input').fill('quince-harbour-lamp-93')
    await welcome.getByTestId('set-password-repeat').locator('input').fill('quince-harbour-lamp-93')
    await welcome.getByTestId('set-password-submit').click()
    await welcome.waitForURL(/\/queue(\?|$)/, { timeout: 15_000 })

    const again = await (await app.browser.newContext()).newPage()
    await again.goto(`${app.server.url}/welcome/${token}`)
    await expect.poll(() => again.getByTestId('invitation-gone').textContent()).toMatch(/already been used/)

    // back on the supervisor's window (no reload): the used invitation has left the list, the new member is in it
    await page.bringToFront()
    await page.evaluate(() => window.dispatchEvent(new Event('focus')))
    await expect.poll(() => page.getByTestId(`invitation-${email}`).count(), { timeout: 15_000 }).toBe(0)
    await expect.poll(() => page.getByTestId(`member-${email}`).textContent()).toMatch(/Saskia Oyelaran/)
    await invitee.close()
    await context.close()
  })

  it('switching an advisor off signs them out at once', async () => {
    const sup = await makeUser('supervisor', 'Browser Supervisor Lieke')
    const advisor = await makeUser('advisor', 'Browser Advisor Tomasz')
    const advisorContext = await app.browser.newContext()
    const advisorPage = await signInAs(advisorContext, app.server.url, advisor.email, advisor.password)
    await advisorPage.waitForURL(/\/queue(\?|$)/)

    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await signInAs(context, app.server.url, sup.email, sup.password)
    await page.waitForURL(/\/dashboard$/)
    await page.goto(`${app.server.url}/team`)
    const row = page.getByTestId(`member-${advisor.email}`)
    await row.getByTestId('member-deactivate').click()
    await page.getByTestId('deactivate-confirm').click()
    await expect.poll(() => row.getByTestId('member-state').textContent()).toMatch(/Switched off/)

    await advisorPage.goto(`${app.server.url}/queue`)
    await advisorPage.waitForURL(/\/sign-in/, { timeout: 15_000 })
    const audit = await db().query<{ action: string }>('SELECT action FROM audit_log WHERE target_user_id = $1', { bind: [advisor.id], type: QueryTypes.SELECT })
    expect(audit.map((a) => a.action)).toEqual(['member.deactivated'])
    await advisorContext.close()
    await context.close()
  })
})
