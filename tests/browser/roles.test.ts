import { describe, expect, it } from 'vitest'
import { join } from 'node:path'
import { screenshotDir, signInAs, useProduct } from '../helpers/browser'
import { makeUser } from '../helpers/api'

const app = useProduct()

describe('signing in as each role', () => {
  it.each([
    ['listener', /\/cases$/],
    ['advisor', /\/queue(\?|$)/],
    ['supervisor', /\/dashboard$/],
  ] as const)('a %s lands on their own home page', async (role, path) => {
    const user = await makeUser(role, `Browser ${role}`)
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 800 } })
    const page = await signInAs(context, app.server.url, user.email, user.password)
    await page.waitForURL(path, { timeout: 15_000 })
    await expect.poll(() => page.getByTestId('page-title').first().textContent()).toBeTruthy()
    await page.screenshot({ path: join(screenshotDir(), `home-${role}.png`) })
    await context.close()
  })

  it('a signed-out visitor to the queue is sent to sign-in and comes back after signing in', async () => {
    const user = await makeUser('advisor', 'Browser Redirect')
    const context = await app.browser.newContext()
    const page = await context.newPage()
    await page.goto(`${app.server.url}/queue`)
    await page.waitForURL(/\/sign-in\?redirect=/)
    await page.getByTestId('signin-email').locator('input').fill(user.email)
    await page.getByTestId('signin-password').locator('input').fill(user.password)
    await page.getByTestId('signin-submit').click()
    await page.waitForURL(/\/queue(\?|$)/)
    await context.close()
  })

  it('a wrong password shows the error banner and stays on sign-in', async () => {
    const user = await makeUser('listener', 'Browser Wrong')
    const context = await app.browser.newContext()
    const page = await signInAs(context, app.server.url, user.email, 'definitely-not-it-123')
    await expect.poll(() => page.getByTestId('signin-error').textContent()).toMatch(/don.t match an account/i)
    expect(page.url()).toMatch(/\/sign-in/)
    await context.close()
  })
})

describe('account and mailbox pages', () => {
  it('a listener turns off non-essential e-mails on the account page; a supervisor reads the outgoing mail', async () => {
    const listener = await makeUser('listener', 'Browser Account')
    const context = await app.browser.newContext()
    const page = await signInAs(context, app.server.url, listener.email, listener.password)
    await page.waitForURL(/\/cases$/)
    await page.goto(`${app.server.url}/account`)
    const toggle = page.getByTestId('account-email-optional').locator('input')
    await expect.poll(() => toggle.isChecked()).toBe(true)
    await toggle.click()
    await expect.poll(() => page.getByText('Saved.').count()).toBe(1)
    await page.reload()
    await expect.poll(() => page.getByTestId('account-email-optional').locator('input').isChecked()).toBe(false)
    await context.close()

    const supervisor = await makeUser('supervisor', 'Browser Mailbox')
    const sctx = await app.browser.newContext()
    const sp = await signInAs(sctx, app.server.url, supervisor.email, supervisor.password)
    await sp.waitForURL(/\/dashboard$/)
    await sp.goto(`${app.server.url}/mailbox`)
    await expect.poll(() => sp.getByTestId('page-title').textContent()).toMatch(/Outgoing mail/)
    await sctx.close()
  })
})
