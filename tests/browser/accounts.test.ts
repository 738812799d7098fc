import { describe, expect, it } from 'vitest'
import { join } from 'node:path'
import { screenshotDir, signInAs, useProduct, waitFor } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { sessionFor } from '../helpers/sockets'

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
})
