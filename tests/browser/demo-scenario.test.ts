import { describe, expect, it } from 'vitest'
import { join } from 'node:path'
import { QueryTypes } from 'sequelize'
import { screenshotDir, signInAs, useProduct } from '../helpers/browser'
import { db } from '../../server/db/sequelize'
import { seedDemo } from '../../server/seed'
import { DEMO_PASSWORD } from '../../server/seed/people'
import { snippetPlaceholders } from '../../shared/schemas/snippet'

const q = <T extends object>(sql: string, bind: unknown[] = []) => db().query<T>(sql, { bind, type: QueryTypes.SELECT })

const app = useProduct({ before: seedDemo, timeout: 600_000 })

describe('the demo scenario — every seeded case is consistent with its status', () => {
  it('shows every status of the lifecycle, with the named demo people and the invented history', async () => {
    const rows = await q<{ status: string; n: number }>(`SELECT status::text, count(*)::int AS n FROM cases GROUP BY status`)
    expect(rows.map((r) => r.status).sort()).toEqual(['closed', 'draft', 'in_review', 'plan_sent', 'submitted', 'waiting_on_listener'])
  })

  it('every case that reached "plan sent" holds the sent plan; every closed case has a rating', async () => {
    const withoutPlan = await q<{ id: string; status: string }>(`
      SELECT c.id, c.status::text FROM cases c
       WHERE (c.status = 'plan_sent' OR EXISTS (SELECT 1 FROM case_events e WHERE e.case_id = c.id AND e.to_status = 'plan_sent'))
         AND NOT EXISTS (SELECT 1 FROM treatment_plans p WHERE p.case_id = c.id AND p.sent_at IS NOT NULL)`)
    expect(withoutPlan).toEqual([])
    const planSent = await q<{ n: number }>(`SELECT count(*)::int AS n FROM cases WHERE status = 'plan_sent'`)
    expect(planSent[0].n).toBeGreaterThanOrEqual(2)
    const unrated = await q<{ id: string }>(`SELECT c.id FROM cases c WHERE c.status = 'closed' AND NOT EXISTS (SELECT 1 FROM case_ratings r WHERE r.case_id = c.id)`)
    expect(unrated).toEqual([])
    // a plan is sent after it was written, by someone on the team
    const odd = await q<{ id: string }>(`SELECT p.id FROM treatment_plans p LEFT JOIN users u ON u.id = p.sent_by WHERE p.sent_at IS NOT NULL AND (p.sent_at < p.created_at OR u.role = 'listener' OR u.id IS NULL)`)
    expect(odd).toEqual([])
  })

  it('every measurement file sent is analysed, and no message speaks of files a case does not have', async () => {
    await expect.poll(async () => (await q<{ n: number }>(`SELECT count(*)::int AS n FROM files WHERE kind = 'measurement' AND analysis_status IS DISTINCT FROM 'done'`))[0].n, { timeout: 300_000, interval: 2000 }).toBe(0)
    const files = await q<{ n: number }>(`SELECT count(*)::int AS n FROM files WHERE kind = 'measurement'`)
    expect(files[0].n).toBeGreaterThanOrEqual(5)
    const claims = await q<{ body: string }>(`
      SELECT m.body FROM messages m JOIN users u ON u.id = m.author_id
       WHERE u.role = 'listener' AND m.body ~* '(here are|attached|upload)' AND NOT EXISTS (SELECT 1 FROM files f WHERE f.case_id = m.case_id)`)
    expect(claims).toEqual([])
  })

  it('the seeded plans seat the listener clear of the back wall, and no setup check names one opening twice', async () => {
    // the seat-near-wall check's 0.6 m (shared/acoustics/setup-flags.ts, common practice, no source)
    const near = await q<{ id: string; gap: number }>(`
      SELECT p.id, (v.body->>'length')::float - (p.body->'seat'->>'x')::float AS gap
        FROM treatment_plans p JOIN room_revisions v ON v.room_id = p.room_id AND v.revision = p.room_revision
       WHERE jsonb_typeof(p.body->'seat') = 'object' AND (v.body->>'length')::float - (p.body->'seat'->>'x')::float < 0.6`)
    expect(near).toEqual([])
    const seated = await q<{ n: number }>(`SELECT count(*)::int AS n FROM treatment_plans WHERE jsonb_typeof(body->'seat') = 'object'`)
    expect(seated[0].n).toBeGreaterThan(0)
    const snaps = await q<{ flags: { id: string; message: string }[] }>(`SELECT body->'flags' AS flags FROM triage_snapshots`)
    const openings = snaps.flatMap((s) => s.flags ?? []).filter((f) => f.id === 'opening-in-reflection-zone')
    expect(openings.length).toBeGreaterThan(0)
    const twice = openings.filter((f) => { const said = f.message.match(/the [a-z ]+ on the [a-z]+ wall/g) ?? []; return new Set(said).size !== said.length })
    expect(twice.map((f) => f.message)).toEqual([])
  })

  it('the queue has variety: the open cases span rooms of different sizes and different flags', async () => {
    const top = await q<{ dims: string; flags: string; title: string }>(`
      SELECT concat(v.body->>'length', 'x', v.body->>'width') AS dims, array_to_string(c.flag_ids, ',') AS flags, c.title
        FROM cases c JOIN room_revisions v ON v.room_id = c.room_id AND v.revision = c.room_revision
       WHERE c.status <> 'closed' AND c.status <> 'draft' ORDER BY c.score DESC NULLS LAST LIMIT 25`)
    expect(new Set(top.map((r) => r.dims)).size).toBeGreaterThanOrEqual(8)
    expect(new Set(top.map((r) => r.flags)).size).toBeGreaterThanOrEqual(6)
    const mostCommon = Math.max(...[...new Set(top.map((r) => r.dims))].map((d) => top.filter((r) => r.dims === d).length))
    expect(mostCommon).toBeLessThanOrEqual(6)
    // the rooms the scenario promises: a small studio, a sofa on the back wall, a cinema with a subwoofer, a sloped attic ceiling
    const rooms = await q<{ body: { length: number; width: number; notes: string; subwoofers: unknown[]; seats: { x: number }[] } }>(`SELECT body FROM room_revisions`)
    expect(rooms.some((r) => r.body.length * r.body.width < 10)).toBe(true)
    expect(rooms.some((r) => r.body.length - r.body.seats[0].x < 0.5 && /sofa/i.test(r.body.notes))).toBe(true)
    expect(rooms.some((r) => r.body.subwoofers.length > 0 && /cinema/i.test(r.body.notes))).toBe(true)
    expect(rooms.some((r) => /slop/i.test(r.body.notes))).toBe(true)
  })

  it('the demo listener opens her case with a plan and reads its steps and predicted result (screenshot saved)', async () => {
    const context = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await signInAs(context, app.server.url, 'listener@roomwright.test', DEMO_PASSWORD)
    await page.waitForURL(/\/(cases|rooms|home)?/)
    const [c] = await q<{ id: string }>(`SELECT c.id FROM cases c JOIN users u ON u.id = c.listener_id WHERE u.email = 'listener@roomwright.test' AND c.status = 'plan_sent'`)
    expect(c).toBeTruthy()
    await page.goto(`${app.server.url}/cases/${c.id}`)
    const plan = page.getByTestId('plan-for-listener')
    await expect.poll(() => plan.textContent(), { timeout: 30_000 }).toMatch(/What to do, in this order/)
    await expect.poll(() => plan.textContent()).toMatch(/corner/i)
    await expect.poll(() => page.getByTestId('analysis-status-done').count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(3)
    // before and after: a measurement from before the plan and the one made after the traps, not one file twice
    await page.reload()
    const before = page.getByTestId('follow-up-before')
    const after = page.getByTestId('follow-up-after')
    await expect.poll(() => after.textContent(), { timeout: 30_000 }).toMatch(/after-the-traps/)
    expect(await before.textContent()).toMatch(/monitor-at-chair \(synthetic demo\)/)
    expect(await page.getByTestId('follow-up-comparison').textContent()).not.toMatch(/Choose two different measurements/)
    await page.screenshot({ path: join(screenshotDir(), 'demo-listener-plan.png'), fullPage: true })
    await context.close()
  })

  it('a seeded snippet inserts with each unit once, the preview shows what the listener reads, and unknown placeholders are refused', async () => {
    const snippets = await q<{ title: string }>(`SELECT title FROM reply_snippets WHERE scope = 'team'`)
    expect(snippets.length).toBeGreaterThanOrEqual(5)
    const [c] = await q<{ id: string }>(`SELECT c.id FROM cases c JOIN users u ON u.id = c.listener_id WHERE u.email = 'jonas.mbeki@roomwright.test' AND c.status = 'in_review'`)
    const context = await app.browser.newContext({ viewport: { width: 1440, height: 900 } })
    const page = await signInAs(context, app.server.url, 'advisor@roomwright.test', DEMO_PASSWORD)
    await page.waitForURL(/\/queue(\?|$)/)
    await page.goto(`${app.server.url}/desk/cases/${c.id}`)
    await page.getByTestId('snippet-picker').click()
    await page.getByTestId('snippet-item').filter({ hasText: 'first look at the room' }).click()
    const text = page.getByTestId('composer-input').locator('textarea').first()
    await expect.poll(() => text.inputValue()).toMatch(/lowest room mode sits at \d+(\.\d)? Hz,/)
    expect(await text.inputValue()).not.toMatch(/Hz Hz|\{\{/)
    await page.getByTestId('composer-preview').click()
    await expect.poll(() => page.getByTestId('composer-preview-pane').textContent()).toMatch(/What the listener will read.*Hello Jonas Mbeki/s)

    await page.getByRole('button', { name: 'Write' }).click()
    await text.fill('Hi {{listener.first}}, the mode at {{room.firstAxialHz}} Hz matters.')
    await expect.poll(() => page.getByTestId('composer-leftover').textContent()).toMatch(/\{\{listener\.first\}\}/)
    await page.getByTestId('snippet-picker').click()
    await page.getByTestId('snippet-save').click()
    await page.getByTestId('snippet-title').locator('input').fill('Broken placeholder')
    await expect.poll(() => page.getByTestId('snippet-placeholder-problem').textContent()).toMatch(/\{\{listener\.first\}\} is not a placeholder; use one of .*\{\{listener\.name\}\}/)
    expect(await page.getByTestId('snippet-title-save').isDisabled()).toBe(true)
    // the valid placeholders are listed beside the editor, open while the words are refused
    const list = page.getByTestId('snippet-placeholders')
    expect(await list.getAttribute('open')).not.toBeNull()
    for (const name of Object.keys(snippetPlaceholders)) expect(await list.textContent()).toContain(`{{${name}}}`)
    // with known placeholders the snippet is kept, and inserting it fills them with each unit once
    await page.keyboard.press('Escape')
    await page.getByTestId('snippet-title-save').waitFor({ state: 'hidden' })
    await text.fill('Hi {{listener.name}}, the mode at {{room.firstAxialHz}} Hz matters.')
    await page.getByTestId('snippet-picker').click()
    await page.getByTestId('snippet-save').click()
    await page.getByTestId('snippet-title').locator('input').fill('Mode at the chair')
    expect(await page.getByTestId('snippet-placeholder-problem').count()).toBe(0)
    await page.getByTestId('snippet-title-save').click()
    await expect.poll(() => page.getByTestId('snippet-kept').textContent()).toMatch(/Kept as your snippet "Mode at the chair"/)
    await text.fill('')
    await page.getByTestId('snippet-picker').click()
    await page.getByTestId('snippet-item').filter({ hasText: 'Mode at the chair' }).click()
    await expect.poll(() => text.inputValue()).toMatch(/^Hi Jonas Mbeki, the mode at \d+(\.\d)? Hz matters\.$/)
    await context.close()
  })
})
