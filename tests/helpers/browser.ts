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
  await page.goto(`${baseUrl}/sign-in`)
  await page.getByTestId('signin-email').locator('input').fill(email)
  await page.getByTestId('signin-password').locator('input').fill(password)
  await page.getByTestId('signin-submit').click()
  return page
}

export const screenshotDir = () => {
  const d = resolve(process.env.SCREENSHOT_DIR ?? '/tmp/roomwright-screenshots')
  mkdirSync(d, { recursive: true })
  return d
}
