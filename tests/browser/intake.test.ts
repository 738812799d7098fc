import { describe, expect, it } from 'vitest'
import { join } from 'node:path'
import { screenshotDir, signInAs, useProduct } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { jpeg } from '../unit/uploads/make-files'
import { addPulse, exponentialDecay, writeWav } from '../unit/signal/synthetic'

const app = useProduct()

/** A 2 s, 48 kHz synthetic impulse response (T = 0.5 s) with one early reflection, as a 24-bit WAV. */
function measurement(): Buffer {
  const x = exponentialDecay({ rt: 0.5, sampleRate: 48_000, seconds: 2, seed: 3, startIndex: 960 })
  addPulse(x, 48_000, 20, 1)
  addPulse(x, 48_000, 26, 0.35)
  return Buffer.from(writeWav([x], 48_000, '24'))
}

describe('a listener describes a room in imperial units, opens a case, uploads and submits', () => {
  it('works end to end in the browser', async () => {
    const user = await makeUser('listener', 'Browser Intake')
    const context = await app.browser.newContext({ viewport: { width: 1440, height: 900 } })
    const page = await signInAs(context, app.server.url, user.email, user.password)
    await page.waitForURL(/\/cases$/)

    // Room editor, imperial units: 18 ft 6 in = 5.6388 m.
    await page.goto(`${app.server.url}/rooms/new`)
    await page.getByTestId('units-imperial').click()
    await page.getByTestId('room-name').locator('input').fill('Den over the garage')
    await page.getByTestId('room-length').locator('input').fill('18 ft 6 in')
    await page.getByTestId('room-width').locator('input').fill("13' 2\"")
    await page.getByTestId('room-height').locator('input').fill('8 ft')
    await page.getByTestId('room-height').locator('input').blur()
    await expect.poll(() => page.getByTestId('room-plan').textContent()).toMatch(/18.?ft.?6/)

    // Drag the left speaker in the top view: the reflection table follows.
    await page.getByRole('tab', { name: /Reflections/ }).click()
    const rows = page.getByTestId('reflection-row')
    await expect.poll(() => rows.count()).toBeGreaterThan(3)
    const before = await rows.allTextContents()
    const speaker = page.getByTestId('plan-speaker-L')
    const box = (await speaker.boundingBox())!
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2)
    await page.mouse.down()
    await page.mouse.move(box.x + box.width / 2 + 25, box.y + box.height / 2 + 40, { steps: 8 })
    await page.mouse.up()
    await expect.poll(async () => (await rows.allTextContents()).join('|')).not.toBe(before.join('|'))
    await page.screenshot({ path: join(screenshotDir(), 'room-editor.png'), fullPage: true })

    await page.getByTestId('room-save').click()
    await page.waitForURL(/\/rooms\/[0-9a-f-]{36}/)

    // Open a case on it.
    await page.goto(`${app.server.url}/cases/new`)
    await page.getByTestId('case-room').click()
    await page.getByRole('option', { name: /Den over the garage/ }).click()
    await page.getByTestId('case-title').locator('input').fill('Bass notes hang on in the den')
    await page.getByTestId('case-description').locator('textarea').first().fill('Low notes keep ringing after the music stops, and the centre image is vague.')
    await page.getByTestId('case-save').click()
    await page.waitForURL(/\/cases\/[0-9a-f-]{36}$/)

    // Upload a photo and a WAV over a slowed connection, so the progress bar shows.
    const cdp = await context.newCDPSession(page)
    await cdp.send('Network.enable')
    await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 20, downloadThroughput: 4_000_000, uploadThroughput: 400_000 })
    await page.getByTestId('upload-input').setInputFiles([
      { name: 'den-front-wall.jpg', mimeType: 'image/jpeg', buffer: await jpeg(1200, 800) },
      { name: 'den-left.wav', mimeType: 'audio/wav', buffer: measurement() },
    ])
    await page.getByTestId('upload-progress').waitFor({ state: 'visible', timeout: 15_000 })
    await page.getByTestId('upload-done').waitFor({ state: 'visible', timeout: 60_000 })
    await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 })
    await expect.poll(() => page.getByTestId('photo-thumb').count(), { timeout: 15_000 }).toBe(1)

    await page.getByTestId('case-submit').click()
    await expect.poll(() => page.getByTestId('case-status').first().textContent(), { timeout: 15_000 }).toMatch(/New/)
    await page.waitForTimeout(1500)
    await page.screenshot({ path: join(screenshotDir(), 'case-submitted.png'), fullPage: true })
    await context.close()
  }, 120_000)
})
