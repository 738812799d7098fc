import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core'
import { resolve } from 'node:path'
import { mkdirSync } from 'node:fs'
import { startServer, type RunningServer } from '../../server/server'

/** Debian's chromium, started headless with the flags this machine needs (no background networking). */
export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-dev-shm-usage'],
  })
}

/** The whole product (built client, API, sockets, jobs) on a free loopback port. */
export async function startProduct(): Promise<RunningServer> {
  return startServer({ port: 0, clientDir: resolve('dist'), background: true })
}

export async function signInAs(context: BrowserContext, baseUrl: string, email: string, password: string): Promise<Page> {
  const page = await context.newPage()
  page.setDefaultTimeout(45_000)
  await page.goto(`${baseUrl}/sign-in`, { waitUntil: 'networkidle' })
  await page.getByTestId('signin-email').locator('input').fill(email)
  await page.getByTestId('signin-password').locator('input').fill(password)
  // Wait for the sign-in answer itself, so a slow machine shows up as slowness and a refusal as its status.
  const answer = page.waitForResponse((r) => r.url().endsWith('/api/auth/login') && r.request().method() === 'POST', { timeout: 45_000 })
  await page.getByTestId('signin-submit').click()
  const res = await answer
  if (res.status() !== 200 && res.status() !== 401 && res.status() !== 403) throw new Error(`sign-in answered ${res.status()}: ${await res.text()}`)
  return page
}

export const screenshotDir = () => {
  const d = resolve(process.env.SCREENSHOT_DIR ?? '/tmp/roomwright-screenshots')
  mkdirSync(d, { recursive: true })
  return d
}
