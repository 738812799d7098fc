/**
 * The listener's measurement hint (issue #16: "the measurements hint still says upload after files are
 * uploaded"): on the open case page it says what was received and what is still worth sending, and it
 * follows uploads live — from this page and from another device — without a reload.
 */
import { describe, expect, it } from 'vitest'
import { join } from 'node:path'
import { screenshotDir, signInAs, useProduct } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { openCase } from '../helpers/cases'
import { httpClient } from '../helpers/sockets'
import { addPulse, exponentialDecay, writeWav } from '../unit/signal/synthetic'

const app = useProduct()

/**
 * A frequency response in Roomwright's text format (FORMAT.md: a header line naming frequency_hz and
 * spl_db, then one frequency a line), 20 Hz to 20 kHz in twelfth-octave steps, so the analysis reads it.
 */
function frequencyResponse(): Buffer {
  const rows = Array.from({ length: 120 }, (_, i) => `${(20 * 2 ** (i / 12)).toFixed(3)}\t${(75 + 6 * Math.sin(i / 5)).toFixed(2)}`)
  return Buffer.from(['# desk seat, left speaker', 'frequency_hz\tspl_db', ...rows].join('\n') + '\n', 'utf8')
}

/** A 2 s, 48 kHz synthetic impulse response (T = 0.5 s) as a 24-bit WAV, mono or stereo (left, right). */
function impulseResponse(channels: 1 | 2): Buffer {
  const one = (seed: number) => {
    const x = exponentialDecay({ rt: 0.5, sampleRate: 48_000, seconds: 2, seed, startIndex: 960 })
    addPulse(x, 48_000, 20, 1)
    return x
  }
  return Buffer.from(writeWav(channels === 1 ? [one(3)] : [one(3), one(4)], 48_000, '24'))
}

describe("the listener's measurement hint follows the files", () => {
  it.each([
    ['desktop', { width: 1280, height: 900 }],
    ['390 px phone', { width: 390, height: 844 }],
  ] as const)('invites, then says what was received and what is still worth sending, live (%s)', async (label, viewport) => {
    const l = await makeUser('listener', `Hint Listener ${label}`)
    const api = await httpClient(app.server.url, l.email, l.password)
    const { case: c } = await openCase(api, { title: `Bass hangs on at the desk (${label})` })
    const phone = viewport.width < 600
    const context = await app.browser.newContext({ viewport, isMobile: phone, hasTouch: phone })
    const page = await signInAs(context, app.server.url, l.email, l.password)
    await page.waitForURL(/\/cases$/)
    await page.goto(`${app.server.url}/cases/${c.id}`, { waitUntil: 'networkidle' })
    const hint = page.getByTestId('measurement-hint')
    await hint.waitFor()
    const state = () => hint.getAttribute('data-state')
    const text = async () => (await hint.innerText()).replace(/\s+/g, ' ').trim()
    const before = await text()
    expect(await state()).toBe('none')
    expect(before).toMatch(/impulse response of each speaker/)
    await hint.scrollIntoViewIfNeeded()
    await page.screenshot({ path: join(screenshotDir(), `measurement-hint-none-${viewport.width}.png`) })
    const reloads: string[] = []
    page.on('framenavigated', (f) => f === page.mainFrame() && reloads.push(f.url()))

    // a frequency response from this page: received, and an impulse response is still worth sending
    await page.getByTestId('upload-input').setInputFiles([{ name: 'desk-seat_left.txt', mimeType: 'text/plain', buffer: frequencyResponse() }])
    await expect.poll(text, { timeout: 30_000 }).toMatch(/^Received: 1 measurement \(1 analysed\)/)
    await expect.poll(state, { timeout: 30_000 }).toBe('partial')
    expect(await text()).toMatch(/Still worth sending: an impulse response as WAV/)

    // a mono WAV of the left speaker from another device: the page hears of it over its socket
    await api.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', api.csrf).attach('file', impulseResponse(1), 'desk-seat_left.wav').expect(201)
    await expect.poll(text, { timeout: 30_000 }).toMatch(/^Received: 2 measurements/)
    await expect.poll(text, { timeout: 60_000 }).toMatch(/Still worth sending: the right speaker alone/)
    await hint.scrollIntoViewIfNeeded()
    await page.screenshot({ path: join(screenshotDir(), `measurement-hint-partial-${viewport.width}.png`) })

    // and the right one: that is what the advisor needs
    await api.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', api.csrf).attach('file', impulseResponse(1), 'desk-seat_right.wav').expect(201)
    await expect.poll(state, { timeout: 60_000 }).toBe('enough')
    await expect.poll(text, { timeout: 60_000 }).toMatch(/^Received: 3 measurements \(3 analysed\)\. That is what your advisor needs for now/)
    await hint.scrollIntoViewIfNeeded()
    await page.screenshot({ path: join(screenshotDir(), `measurement-hint-enough-${viewport.width}.png`) })
    expect(reloads, 'the page was not reloaded').toEqual([])
    await context.close()
  }, 180_000)

  it('a stereo WAV covers both speakers at once', async () => {
    const l = await makeUser('listener', 'Hint Listener Stereo')
    const api = await httpClient(app.server.url, l.email, l.password)
    const { case: c } = await openCase(api, { title: 'One stereo sweep from the sofa' })
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await signInAs(context, app.server.url, l.email, l.password)
    await page.waitForURL(/\/cases$/)
    await page.goto(`${app.server.url}/cases/${c.id}`, { waitUntil: 'networkidle' })
    const hint = page.getByTestId('measurement-hint')
    await page.getByTestId('upload-input').setInputFiles([{ name: 'sofa.wav', mimeType: 'audio/wav', buffer: impulseResponse(2) }])
    await expect.poll(() => hint.getAttribute('data-state'), { timeout: 60_000 }).toBe('enough')
    await context.close()
  }, 120_000)
})
