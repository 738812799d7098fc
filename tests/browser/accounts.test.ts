import { describe, expect, it } from 'vitest'
import { join } from 'node:path'
import { screenshotDir, signInAs, useProduct, waitFor } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { sessionFor } from '../helpers/sockets'
import type { Page } from 'playwright-core'
import { accountStory } from '../../shared/words/people'

// This file's server sends mail to its own fake SMTP server; the test reads the reset e-mail from its mailbox.
const app = useProduct({ fakeSmtp: true })

describe('passwords in the browser', () => {
  it('"Forgot password?" → the e-mail in the fake mailbox → the reset page → sign in with the new password; the link then refuses', async () => {
    const l = await makeUser('listener', 'Browser Listener Ilse')
    const sup = await makeUser('supervisor', 'Browser Mailbox Reader')
    const context = await app.browser.newContext()
    const page = await context.newPage()
    page.setDefaultTimeout(45_000)
    await page.goto(`${app.server.url}/sign-in`, { waitUntil: 'networkidle' })
    await page.getByTestId('signin-email').locator('input').fill(l.email)
    await page.getByTestId('signin-forgot').click()
    await page.waitForURL(/\/forgot-password/)
    expect(await page.getByTestId('forgot-email').locator('input').inputValue()).toBe(l.email)
    await page.getByTestId('forgot-submit').click()
    await expect.poll(() => page.getByTestId('forgot-sent').textContent()).toMatch(/If that address belongs to a Roomwright account/)

    // The e-mail as the local fake SMTP server received it (read as a supervisor, as the mailbox page does).
    const reader = await sessionFor(app.server.url, sup.email, sup.password)
    const link = await waitFor('the reset e-mail in the fake mailbox', async () => {
      const box = (await reader.agent.get(`/api/dev/mailbox?to=${encodeURIComponent(l.email)}`).expect(200)).body.messages as { subject: string; text: string }[]
      const mail = box.find((m) => /new Roomwright password/.test(m.subject))
      return mail && /https?:\/\/\S+\/reset-password#token=[A-Za-z0-9_-]{43}/.exec(mail.text)?.[0]
    }, 60_000)
    const path = new URL(link).pathname + new URL(link).hash

    await page.goto(`${app.server.url}${path}`)
    await expect.poll(() => page.getByTestId('page-title').textContent()).toMatch(/Choose a new password/)
    await page.getByTestId('reset-password').locator('input').fill('heron-slate-meadow-48')
    await page.getByTestId('reset-repeat').locator('input').fill('heron-slate-meadow-48')
    await page.screenshot({ path: join(screenshotDir(), 'reset-password.png'), fullPage: true })
    await page.getByTestId('reset-submit').click()
    await page.waitForURL(/\/sign-in\?reset=done/)
    await page.getByTestId('signin-reset-done').waitFor()
    await context.close()

    const again = await app.browser.newContext()
    const signedIn = await signInAs(again, app.server.url, l.email, 'heron-slate-meadow-48')
    await signedIn.waitForURL(/\/cases$/)
    const reuse = await again.newPage()
    await reuse.goto(`${app.server.url}${path}`)
    await reuse.getByTestId('reset-password').locator('input').fill('another-fresh-password-2')
    await reuse.getByTestId('reset-repeat').locator('input').fill('another-fresh-password-2')
    await reuse.getByTestId('reset-submit').click()
    await expect.poll(() => reuse.getByTestId('reset-gone').textContent()).toMatch(/no longer works/)
    await again.close()
  })

  it('the account page changes the password with the current one; a wrong current password is named on its field', async () => {
    const a = await makeUser('advisor', 'Browser Advisor Jorunn')
    const other = await sessionFor(app.server.url, a.email, a.password)
    const context = await app.browser.newContext()
    const page = await signInAs(context, app.server.url, a.email, a.password)
    await page.waitForURL(/\/queue/)
    await page.goto(`${app.server.url}/account`)
    const form = page.getByTestId('account-password')
    await form.getByTestId('account-current-password').locator('input').fill('not-the-password-0')
    await form.getByTestId('account-new-password').locator('input').fill('tidal-ember-quarry-62')
    await form.getByTestId('account-repeat-password').locator('input').fill('tidal-ember-quarry-62')
    await form.getByTestId('account-password-submit').click()
    await expect.poll(() => form.getByTestId('account-current-password').textContent()).toMatch(/not your current password/)

    await form.getByTestId('account-current-password').locator('input').fill(a.password)
    await form.getByTestId('account-password-submit').click()
    await expect.poll(() => form.getByTestId('account-password-done').textContent()).toMatch(/1 other sign-in was ended/)
    await page.screenshot({ path: join(screenshotDir(), 'account-password.png'), fullPage: true })
    expect((await other.agent.get('/api/auth/me')).status).toBe(401)
    // this browser stays signed in
    await page.reload()
    await form.waitFor()
    expect(page.url()).toMatch(/\/account$/)
    await context.close()
  })

  /** Whom the side panel speaks to, its headline, and whether any listener-only story shows on the page. */
  const story = async (page: Page) => {
    const panel = page.getByTestId('auth-story')
    await panel.waitFor()
    const text = (await panel.textContent()) ?? ''
    return { reader: await panel.getAttribute('data-reader'), headline: await page.getByTestId('auth-story-headline').textContent(), listenerStory: text.includes(accountStory.listener.headline) || /\byour (room|chair)\b/i.test(text) }
  }

  it("sign-in and forgot-password speak to everyone; an advisor's reset link, and sign-in after it, speak of the desk", async () => {
    const a = await makeUser('advisor', 'Browser Advisor Radomir')
    const l = await makeUser('listener', 'Browser Listener Oyelaran')
    const sup = await makeUser('supervisor', 'Browser Mailbox Reader Two')
    const mailbox = await sessionFor(app.server.url, sup.email, sup.password)
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await context.newPage()
    page.setDefaultTimeout(45_000)
    const shots = screenshotDir()

    // sign-in knows nobody yet: the neutral story, with no listener marketing
    await page.goto(`${app.server.url}/sign-in`, { waitUntil: 'networkidle' })
    expect(await story(page)).toEqual({ reader: 'everyone', headline: accountStory.everyone.headline, listenerStory: false })
    await page.screenshot({ path: join(shots, 'sign-in-everyone.png') })
    // a staff-only page asked for: the desk's story, and no "create an account" for staff
    await page.goto(`${app.server.url}/sign-in?redirect=${encodeURIComponent('/queue')}`, { waitUntil: 'networkidle' })
    expect(await story(page)).toEqual({ reader: 'staff', headline: accountStory.staff.headline, listenerStory: false })
    await page.getByTestId('signin-staff-note').waitFor()
    // a listener's page asked for: the listener's story
    await page.goto(`${app.server.url}/sign-in?redirect=${encodeURIComponent('/rooms')}`, { waitUntil: 'networkidle' })
    expect((await story(page)).reader).toBe('listener')
    // sign-up is for listeners
    await page.goto(`${app.server.url}/sign-up`, { waitUntil: 'networkidle' })
    expect((await story(page)).reader).toBe('listener')

    // forgot-password from the plain sign-in page: everyone
    await page.goto(`${app.server.url}/sign-in`, { waitUntil: 'networkidle' })
    await page.getByTestId('signin-email').locator('input').fill(a.email)
    await page.getByTestId('signin-forgot').click()
    await page.waitForURL(/\/forgot-password/)
    expect(await story(page)).toEqual({ reader: 'everyone', headline: accountStory.everyone.headline, listenerStory: false })
    await page.getByTestId('forgot-submit').click()
    await page.getByTestId('forgot-sent').waitFor()

    const linkFor = (email: string) =>
      waitFor(`the reset e-mail to ${email}`, async () => {
        const box = (await mailbox.agent.get(`/api/dev/mailbox?to=${encodeURIComponent(email)}`).expect(200)).body.messages as { subject: string; text: string }[]
        const url = box.map((m) => /https?:\/\/\S+\/reset-password#\S+/.exec(m.text)?.[0]).find(Boolean)
        return url && new URL(url).pathname + new URL(url).hash
      }, 60_000)

    // the advisor's link says it is a staff account: the reset page speaks of the desk
    const staffLink = await linkFor(a.email)
    expect(staffLink).toMatch(/#token=[A-Za-z0-9_-]{43}&for=staff$/)
    await page.goto(`${app.server.url}${staffLink}`)
    await page.getByTestId('reset-password').waitFor()
    expect(await story(page)).toEqual({ reader: 'staff', headline: accountStory.staff.headline, listenerStory: false })
    await page.screenshot({ path: join(shots, 'reset-password-staff.png') })
    await page.getByTestId('reset-password').locator('input').fill('granite-osprey-lantern-31')
    await page.getByTestId('reset-repeat').locator('input').fill('granite-osprey-lantern-31')
    await page.getByTestId('reset-submit').click()
    await page.waitForURL(/\/sign-in\?reset=done/)
    await page.getByTestId('signin-reset-done').waitFor()
    expect(await story(page)).toEqual({ reader: 'staff', headline: accountStory.staff.headline, listenerStory: false })
    await page.getByTestId('signin-staff-note').waitFor()

    // a listener's link says so too: the listener's story
    const lc = await app.browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true })
    const lp = await lc.newPage()
    lp.setDefaultTimeout(45_000)
    await lp.goto(`${app.server.url}/forgot-password?email=${encodeURIComponent(l.email)}`, { waitUntil: 'networkidle' })
    await lp.getByTestId('forgot-submit').click()
    await lp.getByTestId('forgot-sent').waitFor()
    const listenerLink = await linkFor(l.email)
    expect(listenerLink).toMatch(/&for=listener$/)
    await lp.goto(`${app.server.url}${listenerLink}`)
    await lp.getByTestId('reset-password').waitFor()
    expect((await story(lp)).reader).toBe('listener')
    await lp.screenshot({ path: join(shots, 'reset-password-listener-phone.png'), fullPage: true })
    await lc.close()
    await context.close()
  }, 180_000)
})
