import { describe, expect, it } from 'vitest'
import nodemailer from 'nodemailer'
import { join } from 'node:path'
import { QueryTypes } from 'sequelize'
import { screenshotDir, signInAs, useProduct, waitFor } from '../helpers/browser'
import { makeUser } from '../helpers/api'
import { sessionFor } from '../helpers/sockets'
import { testRoom } from '../helpers/rooms'

// This file's server sends mail to its own fake SMTP server.
const app = useProduct({ fakeSmtp: true })

describe('advisor and listener in two browsers, with e-mail both ways', () => {
  it('the reply shows live for the listener, reaches the mailbox, and the e-mailed answer shows live for the advisor', async () => {
    const l = await makeUser('listener', 'Odalys Brenneke')
    const a = await makeUser('advisor', 'Kasimir Oduya')
    const s = await makeUser('supervisor', 'Wenke Aalto')
    // The listener's case, set up over HTTP.
    const lh = await sessionFor(app.server.url, l.email, l.password)
    const room = (await lh.agent.post('/api/rooms').set('X-CSRF-Token', lh.csrf).send(testRoom({ name: 'Music room with a piano' })).expect(201)).body
    const c = (await lh.agent.post('/api/cases').set('X-CSRF-Token', lh.csrf).send({ roomId: room.id, title: 'Piano sounds thin from the sofa' }).expect(201)).body
    await lh.agent.patch(`/api/cases/${c.id}`).set('X-CSRF-Token', lh.csrf).send({ status: 'submitted', fromStatus: 'draft' }).expect(200)

    const listenerCtx = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const advisorCtx = await app.browser.newContext({ viewport: { width: 1440, height: 900 } })
    const lp = await signInAs(listenerCtx, app.server.url, l.email, l.password)
    await lp.waitForURL(/\/cases$/)
    await lp.goto(`${app.server.url}/cases/${c.id}`)
    await lp.getByTestId('thread').waitFor()
    const ap = await signInAs(advisorCtx, app.server.url, a.email, a.password)
    await ap.waitForURL(/\/queue(\?|$)/)
    await ap.goto(`${app.server.url}/desk/cases/${c.id}`)
    await ap.getByTestId('composer-input').waitFor()

    // The advisor replies; the listener's open page shows it without a reload.
    const reply = 'Thanks Odalys. Could you try the sofa **30 cm further from the back wall**?'
    await ap.getByTestId('composer-input').locator('textarea').first().fill(reply)
    await ap.getByTestId('composer-send').click()
    await expect.poll(() => lp.getByTestId('thread-message').allTextContents(), { timeout: 20_000 }).toEqual(
      expect.arrayContaining([expect.stringContaining('30 cm further from the back wall')]),
    )

    // The e-mail reached the fake mailbox (read as a supervisor, as the mailbox page does).
    const sh = await sessionFor(app.server.url, s.email, s.password)
    const mail = await waitFor('the reply e-mail', async () => {
      const box = (await sh.agent.get(`/api/dev/mailbox?to=${encodeURIComponent(l.email)}`).expect(200)).body.messages as { subject: string; html: string; text: string; headers: Record<string, string> }[]
      return box.find((m) => /Could you try the sofa/.test(m.text ?? ''))
    })
    expect(mail.subject).toMatch(/Piano sounds thin/)
    // The markdown is rendered (and sanitised) in the e-mail's HTML part.
    expect(mail.html).toContain('<strong>30 cm further from the back wall</strong>')
    // The mailbox page shows the Reply-To address that reply-by-e-mail depends on.
    const supCtx = await app.browser.newContext({ viewport: { width: 1280, height: 900 } })
    const sp = await signInAs(supCtx, app.server.url, s.email, s.password)
    await sp.waitForURL(/\/dashboard$/)
    await sp.goto(`${app.server.url}/mailbox`)
    await sp.getByText(mail.subject).first().click()
    await expect.poll(() => sp.getByTestId('mailbox-reply-to').textContent()).toMatch(/Reply-To: .*reply\+[A-Za-z0-9]+@/)
    await supCtx.close()
    const { db } = await import('../../server/db/sequelize')
    const [{ reply_token: token }] = await db().query<{ reply_token: string }>('SELECT reply_token FROM cases WHERE id = $1', { bind: [c.id], type: QueryTypes.SELECT })

    // The listener answers by e-mail (through the fake SMTP server); the advisor's page shows it live.
    const transport = nodemailer.createTransport({ host: '127.0.0.1', port: app.smtp.port, secure: false, ignoreTLS: true })
    await transport.sendMail({
      from: l.email,
      to: `reply+${token}@reply.roomwright.test`,
      subject: 'Re: Piano sounds thin from the sofa',
      text: 'Moved it: the piano sounds fuller already.\n\nOn Tue, 1 Dec 2026 at 21:14, Kasimir Oduya <desk@roomwright.test> wrote:\n> Thanks Odalys. Could you try the sofa 30 cm further',
    })
    await expect.poll(() => ap.getByTestId('thread-message').allTextContents(), { timeout: 20_000 }).toEqual(
      expect.arrayContaining([expect.stringContaining('the piano sounds fuller already')]),
    )
    const texts = await ap.getByTestId('thread-message').allTextContents()
    expect(texts.join('\n')).not.toMatch(/Kasimir Oduya wrote/)
    await ap.screenshot({ path: join(screenshotDir(), 'workspace-live.png'), fullPage: true })
    await lp.screenshot({ path: join(screenshotDir(), 'listener-case-live.png'), fullPage: true })
    await listenerCtx.close()
    await advisorCtx.close()
  }, 120_000)
})
