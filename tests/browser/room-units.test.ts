import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { randomUUID } from 'node:crypto'
import { consoleErrors, signInAs, useProduct } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { createRoom } from '../../server/services/rooms'
import { createCase, updateCase } from '../../server/services/cases'
import { addCaseFile } from '../../server/services/files'
import { storage } from '../../server/storage'
import { demoRooms } from '../../server/seed/rooms'
import { roomSchema } from '../../shared/schemas/room'

const app = useProduct()

const input = (page: Page, id: string) => page.getByTestId(id).locator('input')

describe('the room form in feet and inches', () => {
  it('reads the forms people type, says what a bare number means and that the choice is kept; errors speak feet', async () => {
    const l = await makeUser('listener', 'Hollis Varga')
    const context = await app.browser.newContext({ viewport: { width: 1440, height: 900 } })
    const page = await signInAs(context, app.server.url, l.email, l.password)
    const errors = consoleErrors(page)
    await page.waitForURL(/\/cases$/)
    await page.goto(`${app.server.url}/rooms/new`, { waitUntil: 'networkidle' })
    await page.getByTestId('units-imperial').click()
    await expect.poll(() => page.getByTestId('units-remembered').textContent()).toMatch(/Feet and inches: kept for your next visit/)

    // 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959); 12 ft 6 in = 3.81 m
    for (const typed of [`12' 6"`, '12 ft 6 in', '12.5 ft', '150 in', '150 inches']) {
      await input(page, 'room-length').fill(typed)
      await input(page, 'room-width').focus()
      await expect.poll(() => input(page, 'room-length').inputValue(), { message: typed }).toBe('12 ft 6 in')
    }
    await input(page, 'room-length').focus()
    await expect.poll(() => page.getByTestId('room-length').textContent()).toMatch(/A plain number is feet/)

    // a speaker beyond the back wall: the error names feet, never metres
    await input(page, 'speaker-x-0').fill('14')
    await input(page, 'speaker-y-0').focus()
    await expect.poll(() => page.getByTestId('speaker-x-0').textContent()).toMatch(/14 ft lies beyond the length 12 ft 6 in/)
    expect(await page.getByTestId('speaker-x-0').textContent()).not.toMatch(/\d m\b/)

    // zero width: no plan drawing, no negative or zero figures in the summary, no console errors
    const width = await input(page, 'room-width').inputValue()
    await input(page, 'room-width').fill('0')
    await input(page, 'room-height').focus()
    await page.getByTestId('plan-waiting').waitFor()
    await expect.poll(() => page.getByTestId('page-subtitle').textContent()).toMatch(/Size not complete/)
    await page.getByTestId('room-save').click()
    await expect.poll(() => page.getByTestId('room-save-status').textContent()).toMatch(/Not saved/)
    // fixing the fields clears the refusal
    await input(page, 'room-width').fill(width)
    await input(page, 'speaker-x-0').fill('3')
    await input(page, 'room-height').focus()
    await expect.poll(() => page.getByTestId('room-save-status').textContent()).not.toMatch(/Not saved/)
    await expect.poll(() => page.locator('[data-testid="plan-waiting"]').count()).toBe(0)
    expect(errors).toEqual([])
    await context.close()
  }, 180_000)
})

describe('a frequency-response file with the wrong header', () => {
  it('says what the header should be, with a one-line example and a link to the format', async () => {
    const l = await makeUser('listener', 'Ingrid Saloni')
    const room = await createRoom(l, roomSchema.parse(demoRooms.smallStudio))
    const c = await createCase(l, { roomId: room.id, title: 'Wrong header file' })
    await updateCase(l, c.id, { status: 'submitted', fromStatus: 'draft' })
    const text = 'Freq,Level\n20,70\n40,72\n'
    const key = `incoming/${randomUUID()}.txt`
    await storage().put(key, Buffer.from(text))
    await addCaseFile(l, c.id, { key, size: text.length, originalname: 'export.txt', mime: 'text/plain', mimetype: 'text/plain', kind: 'measurement', format: 'text', fieldname: 'file' })
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await signInAs(context, app.server.url, l.email, l.password)
    await page.waitForURL(/\/cases$/)
    await page.goto(`${app.server.url}/cases/${c.id}`)
    await expect.poll(() => page.getByTestId('analysis-status-failed').count(), { timeout: 60_000 }).toBe(1)
    // the newest measurement opens by itself
    await expect.poll(() => page.getByTestId('analysis-header-example').textContent()).toMatch(/frequency_hz, spl_db\s+20, 78\.4/)
    await page.getByTestId('analysis-format-link').click()
    await page.waitForURL(/#frequency-response-format$/)
    await context.close()
  }, 180_000)
})
