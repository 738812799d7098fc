import { afterAll, beforeAll } from 'vitest'
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core'
import { resolve } from 'node:path'
import { mkdirSync } from 'node:fs'
import { startServer, type RunningServer } from '../../server/server'
import { freePort } from '../../server/dev/cluster'
import type { FakeSmtp } from '../../server/mail/fake-smtp'
import type { Role } from '../../shared/schemas/auth'

export { waitFor } from './wait'

/** The window sizes the browser tests look at (CSS px): a desktop, and a phone 390 px wide. */
export const DESKTOP = { width: 1280, height: 900 }
export const PHONE = { width: 390, height: 844 }

/** The demo scenario's person of each role (server/seed), as the tests that run on it sign in. */
export const DEMO_EMAILS: Record<Role, string> = {
  listener: 'listener@roomwright.test',
  advisor: 'advisor@roomwright.test',
  supervisor: 'supervisor@roomwright.test',
}

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

/** What a browser test file works against; filled in by the file's beforeAll (see `useProduct`). */
export interface Product {
  server: RunningServer
  browser: Browser
  /** The file's own fake SMTP server, with `fakeSmtp: true`. */
  smtp: FakeSmtp
}

/**
 * The start-up of every browser test file: before its tests, the whole product on a free port and one
 * headless Chromium (and, with `fakeSmtp`, a fake SMTP server of its own that the product sends to; with
 * `before`, e.g. the demo seed, run first); after them, all closed again, then `after`.
 */
export function useProduct(opts: { fakeSmtp?: boolean; before?: () => Promise<unknown>; after?: () => Promise<unknown>; timeout?: number } = {}): Product {
  const product = {} as Product
  beforeAll(async () => {
    if (opts.fakeSmtp) {
      process.env.SMTP_PORT = String(await freePort())
      process.env.FAKE_SMTP = 'on'
      const { startFakeSmtp } = await import('../../server/mail/fake-smtp')
      product.smtp = await startFakeSmtp({ port: Number(process.env.SMTP_PORT) })
    }
    await opts.before?.()
    product.server = await startProduct()
    product.browser = await launchBrowser()
  }, opts.timeout)
  afterAll(async () => {
    await product.browser?.close()
    await product.server?.close()
    await product.smtp?.stop()
    await opts.after?.()
  })
  return product
}


/** Every console error and uncaught page error the page shows from now on. */
export function consoleErrors(page: Page): string[] {
  const seen: string[] = []
  page.on('console', (m) => m.type() === 'error' && seen.push(m.text()))
  page.on('pageerror', (e) => seen.push(String(e)))
  return seen
}

/** Every answer of 400 or more the page receives from `baseUrl`, as `status METHOD /path`, pushed to `into`. */
export function failingAnswers(page: Page, baseUrl: string, into: string[] = []): string[] {
  page.on('response', (r) => {
    if (r.status() >= 400 && r.url().startsWith(baseUrl)) into.push(`${r.status()} ${r.request().method()} ${new URL(r.url()).pathname}`)
  })
  return into
}
