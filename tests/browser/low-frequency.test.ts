import { describe, expect, it } from 'vitest'
import { join } from 'node:path'
import { screenshotDir, signInAs, useProduct } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { sessionFor } from '../helpers/sockets'
import { testRoom } from '../helpers/rooms'
import { writeWav } from '../unit/signal/synthetic'
import { modalIr } from '../unit/signal/modal-synthetic'

const app = useProduct()

/** A signed-in API agent against the running product. */
const agentFor = (user: { email: string; password: string }) => sessionFor(app.server.url, user.email, user.password)

// The room as the listener states it (5.0 m long) and a measurement made in a room 0.3 m longer:
// the modal impulse response of tests/unit/signal/modal-synthetic.ts (Rayleigh's closed form).
const stated = testRoom({
  length: 5.0, width: 3.8, height: 2.6, openings: [],
  speakers: [{ label: 'L', x: 0.35, y: 0.4, z: 0.35 }, { label: 'R', x: 0.35, y: 3.4, z: 0.35 }],
  seats: [{ label: 'Sofa left', x: 3.9, y: 1.2, z: 1.3 }, { label: 'Sofa middle', x: 3.9, y: 1.9, z: 1.3 }, { label: 'Sofa right', x: 3.9, y: 2.6, z: 1.3 }],
})
function measurement(): Buffer {
  const x = modalIr({ length: 5.3, width: 3.8, height: 2.6 }, { x: 0.35, y: 0.4, z: 0.35 }, { x: 3.9, y: 1.2, z: 1.3 }, { rt: 0.8, sampleRate: 48_000, seconds: 3 })
  let peak = 0
  for (const v of x) peak = Math.max(peak, Math.abs(v))
  for (let i = 0; i < x.length; i++) x[i] *= 0.9 / peak
  return Buffer.from(writeWav([x], 48_000, '24'))
}

async function submittedCase(title: string) {
  const listener = await makeUser('listener', 'Browser Bass Listener')
  const advisor = await makeUser('advisor', 'Browser Bass Advisor')
  const l = await agentFor(listener)
  const room = (await l.agent.post('/api/rooms').set('X-CSRF-Token', l.csrf).send(stated).expect(201)).body
  const c = (await l.agent.post('/api/cases').set('X-CSRF-Token', l.csrf).send({ roomId: room.id, title }).expect(201)).body
  await l.agent.patch(`/api/cases/${c.id}`).set('X-CSRF-Token', l.csrf).send({ status: 'submitted', fromStatus: 'draft' }).expect(200)
  const a = await agentFor(advisor)
  await a.agent.patch(`/api/cases/${c.id}`).set('X-CSRF-Token', a.csrf).send({ status: 'in_review', fromStatus: 'submitted' }).expect(200)
  return { listener, advisor, l, a, caseId: c.id as string }
}

describe('measured bass peaks explained', () => {
  it('the workspace labels each peak with its mode, shows the explained share and asks about the length in one click; the listener reads it in plain words', async () => {
    const { listener, advisor, l, caseId } = await submittedCase('Browser bass: boomy sofa')
    await l.agent.post(`/api/cases/${caseId}/files`).set('X-CSRF-Token', l.csrf).attach('file', measurement(), 'sofa-left.wav').expect(201)
    await expect.poll(async () => (await l.agent.get(`/api/cases/${caseId}/files`)).body.files[0]?.analysis?.status, { timeout: 60_000, interval: 1000 }).toBe('done')

    const context = await app.browser.newContext({ viewport: { width: 1500, height: 1000 } })
    const page = await signInAs(context, app.server.url, advisor.email, advisor.password)
    await page.waitForURL(/\/queue(\?|$)/)
    await page.goto(`${app.server.url}/desk/cases/${caseId}`)
    await page.getByTestId('tab-bass-peaks').click({ timeout: 30_000 })
    const labels = page.getByTestId('lf-peak-label')
    await expect.poll(() => labels.count(), { timeout: 15_000 }).toBeGreaterThan(2)
    // Rayleigh: the length mode of the true 5.3 m room lies at c/(2·5.3) ≈ 32 Hz; the label names it with its height and ring time
    expect((await labels.allTextContents()).join('\n')).toMatch(/^3[2-3] Hz: length mode 1-0-0, \d+ dB, \d+ ms$/m)
    expect(await page.getByTestId('lf-explained-share').textContent()).toMatch(/Measured bass peaks explained: \d+ of \d+/)
    await page.getByTestId('lf-dimension-warning').waitFor()
    await page.getByTestId('lf-ask-dimensions').click()
    await expect.poll(() => page.locator('.case-thread-composer textarea').first().inputValue()).toMatch(/the length \(you gave 5\.00 m; the bass peaks fit about 5\.[2-3]\d m\)/)
    await page.screenshot({ path: join(screenshotDir(), 'workspace-bass-peaks.png'), fullPage: true })
    await context.close()

    const lc = await app.browser.newContext({ viewport: { width: 1100, height: 1000 } })
    const lp = await signInAs(lc, app.server.url, listener.email, listener.password)
    await lp.waitForURL(/\/cases$/)
    await lp.goto(`${app.server.url}/cases/${caseId}`)
    await lp.getByTestId('tab-bass-peaks').click({ timeout: 30_000 })
    expect(await lp.getByTestId('lf-plain').textContent()).toMatch(/come from the room's own resonances/)
    expect(await lp.getByTestId('lf-diagnosis').textContent()).toMatch(/Could you measure it again\?/)
    await lc.close()
  }, 150_000)

  it('the plan editor searches subwoofer layouts for the sofa, draws the best on the plan and adopts it with its predicted before and after', async () => {
    const { advisor, a, caseId } = await submittedCase('Browser bass: where should the subwoofers go')
    const context = await app.browser.newContext({ viewport: { width: 1500, height: 1100 } })
    const page = await signInAs(context, app.server.url, advisor.email, advisor.password)
    await page.waitForURL(/\/queue(\?|$)/)
    await page.goto(`${app.server.url}/desk/cases/${caseId}/plan`)
    await page.getByTestId('plan-subwoofer-search-panel').click({ timeout: 20_000 })
    await page.getByTestId('subwoofer-search').click()
    await page.getByTestId('subwoofer-figures').waitFor({ timeout: 30_000 })
    await expect.poll(() => page.getByTestId('plan-sub-suggested').count()).toBe(2)
    await page.getByTestId('subwoofer-count').getByText('4 subs').click()
    await expect.poll(() => page.getByTestId('plan-sub-suggested').count()).toBe(4)
    await page.getByTestId('subwoofer-adopt').click()
    await page.getByTestId('plan-subwoofers-prediction').waitFor({ timeout: 20_000 })
    expect(await page.getByTestId('plan-subwoofers-prediction').textContent()).toMatch(/seat-to-seat variation\s*[\d.]+ dB\s*[\d.]+ dB/)
    await page.screenshot({ path: join(screenshotDir(), 'plan-editor-subwoofers.png'), fullPage: true })
    await page.getByTestId('plan-save').click()
    await page.getByTestId('plan-saved-note').waitFor({ timeout: 15_000 })
    const saved = (await a.agent.get(`/api/cases/${caseId}/plans/1`).expect(200)).body
    expect(saved.body.subwooferLayout.positions).toHaveLength(4)
    expect(saved.predictions.subwooferLayout.after.seatToSeatDb).toBeLessThan(saved.predictions.subwooferLayout.before.seatToSeatDb)
    await context.close()
  }, 150_000)
})
