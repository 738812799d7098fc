import './setup-config'
import { describe, expect, it } from 'vitest'
import { JSDOM } from 'jsdom'
import { Marked } from 'marked'
import { UNIT_PUBLIC_URL } from './setup-config'
import { CASE_KINDS, EMAIL_KINDS, ESSENTIAL_KINDS, fillTemplate, renderEmail, renderMarkdownSafe, type EmailKind } from '../../../server/mail/templates'

const CASE_ID = '7d1f3c52-94b0-4e8e-a2b5-1c0f5e6a9b21'
const sample: Record<EmailKind, Record<string, unknown>> = {
  reply: { recipientName: 'Ysolde Marchetti', advisorName: 'Odile Brenner', caseTitle: 'Boom at 43 Hz in the loft', caseId: CASE_ID, body: 'Move the seat **40 cm** forward.' },
  'info-requested': { recipientName: 'Ysolde Marchetti', advisorName: 'Odile Brenner', caseTitle: 'Boom at 43 Hz in the loft', caseId: CASE_ID, body: 'Could you measure the left speaker alone?' },
  'status-changed': { recipientName: 'Ysolde Marchetti', caseTitle: 'Boom at 43 Hz in the loft', caseId: CASE_ID, status: 'closed' },
  'plan-sent': { recipientName: 'Ysolde Marchetti', advisorName: 'Odile Brenner', caseTitle: 'Boom at 43 Hz in the loft', caseId: CASE_ID, summary: '1. Two corner bass traps\n2. Panels at the side-wall reflection points' },
  invitation: { recipientName: 'Tamsin Okafor', inviterName: 'Priya Venkataraman', role: 'advisor', setPasswordUrl: 'https://desk.roomwright.test/set-password?token=q8Zr41&who=tamsin', expiresAt: '2031-03-04T05:06:00Z' },
  welcome: { recipientName: 'Ysolde Marchetti' },
  'password-reset': { recipientName: 'Ysolde Marchetti', resetUrl: 'https://desk.roomwright.test/reset-password#token=Zp3qLm8', expiresAt: '2031-03-04T05:06:00Z' },
  'password-changed': { recipientName: 'Ysolde Marchetti', changedAt: '2031-03-04T05:06:00Z', how: 'reset-link' },
}
const render = (kind: EmailKind, over: Record<string, unknown> = {}) => renderEmail(kind, { ...sample[kind], ...over } as never)
const REPLY_HINT = /reply to this e-mail to answer in the case/i

describe('renderEmail — every kind', () => {
  it.each(EMAIL_KINDS)('%s renders a one-line subject, an HTML page with the wordmark, and a text part', (kind) => {
    const e = render(kind)
    expect(e.subject.length).toBeGreaterThan(5)
    expect(e.subject).not.toMatch(/[\r\n]/)
    expect(e.subject).not.toMatch(/\{\{|\}\}/)
    expect(e.html).toMatch(/^<!doctype html>/i)
    expect(e.html).toContain('Roomwright</span>')
    expect(e.html).toContain('#0f4c4f')
    expect(e.html).not.toMatch(/\{\{|\}\}/)
    expect(e.text).toContain('ROOMWRIGHT')
    expect(e.text).not.toMatch(/\{\{|\}\}/)
    expect(e.text).toContain(String(sample[kind].recipientName))
    expect(e.html).toContain(String(sample[kind].recipientName))
  })

  it.each([...CASE_KINDS])('%s carries the case title, the link to the case and the reply hint, in HTML and text', (kind) => {
    const e = render(kind)
    const link = `${UNIT_PUBLIC_URL}/cases/${CASE_ID}`
    for (const part of [e.html, e.text]) {
      expect(part).toContain('Boom at 43 Hz in the loft')
      expect(part).toContain(link)
      expect(part).toMatch(REPLY_HINT)
      expect(part).toContain('Write your answer above this line')
    }
    expect(e.subject).toContain('Boom at 43 Hz in the loft')
    expect(e.html).toContain(`href="${link}"`)
  })

  it.each(['invitation', 'welcome', 'password-reset', 'password-changed'] as const)('%s is not about a case, so it has no reply hint', (kind) => {
    const e = render(kind)
    expect(e.html).not.toMatch(REPLY_HINT)
    expect(e.text).not.toMatch(REPLY_HINT)
  })

  it('the footer says whether the kind is sent even with optional e-mails off', () => {
    for (const kind of EMAIL_KINDS) {
      const e = render(kind)
      if (ESSENTIAL_KINDS.has(kind)) expect(e.text).toContain('sent even when optional e-mails are turned off')
      else expect(e.text).toContain('turn off optional e-mails')
    }
  })

  it('reply renders its markdown body as HTML and keeps the markdown source in the text part', () => {
    const e = render('reply')
    expect(e.html).toContain('<strong>40 cm</strong>')
    expect(e.text).toContain('Move the seat **40 cm** forward.')
  })

  it('status-changed words each change differently and accepts the case services\' "change: received"', () => {
    const heads = (['submitted', 'closed', 'reopened'] as const).map((status) => render('status-changed', { status }).subject)
    expect(new Set(heads).size).toBe(3)
    expect(render('status-changed', { status: undefined, change: 'received' }).subject).toBe(heads[0])
  })

  it('password-reset shows the link and its expiry in UTC; password-changed says how and links to sign-in', () => {
    const e = render('password-reset')
    expect(e.html).toContain('href="https://desk.roomwright.test/reset-password#token=Zp3qLm8"')
    expect(e.text).toContain('https://desk.roomwright.test/reset-password#token=Zp3qLm8')
    expect(e.text).toContain('4 Mar 2031, 05:06 UTC')
    const c = render('password-changed')
    expect(c.text).toContain('with a link sent to this address')
    expect(c.text).toContain(`${UNIT_PUBLIC_URL}/sign-in`)
    expect(render('password-changed', { how: 'signed-in' }).text).toContain('while signed in')
  })

  it('invitation shows the link (escaped in the href) and the expiry in UTC', () => {
    const e = render('invitation')
    expect(e.html).toContain('href="https://desk.roomwright.test/set-password?token=q8Zr41&amp;who=tamsin"')
    expect(e.text).toContain('https://desk.roomwright.test/set-password?token=q8Zr41&who=tamsin')
    expect(e.text).toContain('4 Mar 2031, 05:06 UTC')
    expect(e.subject).toContain('advisor')
  })

  it('accepts the aliases listenerName, authorName, bodyMarkdown and an explicit caseUrl', () => {
    const e = renderEmail('reply', { listenerName: 'Ines Albright', authorName: 'Bao Tran', caseTitle: 'Flutter echo', caseUrl: 'https://other.roomwright.test/cases/9', bodyMarkdown: 'Hang a rug.' } as never)
    expect(e.text).toContain('Hello Ines Albright')
    expect(e.text).toContain('Bao Tran answered')
    expect(e.text).toContain('Hang a rug.')
    expect(e.text).toContain('https://other.roomwright.test/cases/9')
  })
})

describe('renderEmail — placeholders are filled safely', () => {
  const hostile = `<img src=x onerror="alert(1)"> & "Ana's" room`
  it('escapes every placeholder in HTML and leaves the text part literal', () => {
    const e = render('reply', { caseTitle: hostile, recipientName: '<b>Ana</b>', advisorName: 'O"dile <script>' })
    expect(e.html).not.toContain('<img src=x')
    expect(e.html).not.toContain('<b>Ana</b>')
    expect(e.html).not.toContain('<script>')
    expect(e.html).toContain('&lt;img src=x onerror=&quot;alert(1)&quot;&gt; &amp; &quot;Ana&#39;s&quot; room')
    expect(e.html).toContain('Hello &lt;b&gt;Ana&lt;/b&gt;')
    expect(e.text).toContain(`“${hostile}”`)
  })
  it('keeps line breaks out of the subject (no header injection)', () => {
    const e = render('reply', { caseTitle: 'Loft\r\nBcc: everyone@example.test' })
    expect(e.subject).not.toMatch(/[\r\n]/)
    expect(e.subject).toContain('Loft Bcc: everyone@example.test')
  })
  it('a value that looks like a placeholder is inserted as it is, never expanded', () => {
    expect(fillTemplate('Hi {{a}} and {{{b}}}', { a: '{{b}}', b: '<i>x</i>' }, 'html')).toBe('Hi {{b}} and <i>x</i>')
  })
  it('a placeholder without a value is an error naming it', () => {
    expect(() => fillTemplate('Hi {{nobody}}', {}, 'text', 't')).toThrow(/\{\{nobody\}\}/)
  })
  it('missing or wrong vars are a TypeError naming the field', () => {
    expect(() => renderEmail('reply', { ...sample.reply, advisorName: undefined } as never)).toThrow(/advisorName/)
    expect(() => renderEmail('reply', { ...sample.reply, caseId: undefined } as never)).toThrow(/caseId or caseUrl/)
    expect(() => renderEmail('invitation', { ...sample.invitation, setPasswordUrl: 'javascript:alert(1)' } as never)).toThrow(TypeError)
    expect(() => renderEmail('no-such-kind' as EmailKind, {} as never)).toThrow(/no e-mail template/)
  })
})

const XSS = [
  '<script>alert(1)</script>',
  '<img src="x" onerror="alert(2)">',
  '[click me](javascript:alert(3))',
  '<a href="javascript:alert(4)">link</a>',
  '<a href="JaVaScRiPt:alert(5)">mixed case</a>',
  '<a href="&#106;avascript:alert(6)">entity</a>',
  '<iframe src="https://evil.example.test"></iframe>',
  '<svg onload="alert(7)"><circle r="4"/></svg>',
  '<p style="background:url(javascript:alert(8))" onclick="alert(9)">styled</p>',
  '<a href="data:text/html;base64,PHNjcmlwdD5hbGVydCgxMCk8L3NjcmlwdD4=">data</a>',
  '<form action="https://evil.example.test"><input name="password"></form>',
  '![pic](javascript:alert(11))',
  '<details open ontoggle="alert(12)">x</details>',
].join('\n\n')

function dangers(html: string, { styles }: { styles: boolean }): string[] {
  const { document } = new JSDOM(html).window
  const found: string[] = []
  for (const el of document.querySelectorAll('*')) {
    const tag = el.tagName.toLowerCase()
    if (['script', 'iframe', 'form', 'input', 'object', 'embed', 'svg'].includes(tag)) found.push(`<${tag}>`)
    for (const a of el.attributes) {
      if (/^on/i.test(a.name)) found.push(`${tag}[${a.name}]`)
      if (/^(href|src|action|formaction|xlink:href)$/i.test(a.name) && /^\s*(javascript|data|vbscript):/i.test(a.value)) found.push(`${tag}[${a.name}=${a.value}]`)
      if (styles && a.name === 'style') found.push(`${tag}[style]`)
    }
  }
  return found
}

describe('renderMarkdownSafe — the one server-side markdown renderer', () => {
  it('renders markdown: emphasis, lists, code, and links that open safely', () => {
    const html = renderMarkdownSafe('**Bass** at *43 Hz*\n\n- corner trap\n- side panels\n\n`RT60` and [a guide](https://example.test/guide)')
    expect(html).toContain('<strong>Bass</strong>')
    expect(html).toContain('<em>43 Hz</em>')
    expect(html).toContain('<li>corner trap</li>')
    expect(html).toContain('<code>RT60</code>')
    expect(html).toMatch(/<a href="https:\/\/example\.test\/guide" rel="noopener noreferrer nofollow" target="_blank">a guide<\/a>/)
  })
  it('neutralises XSS payloads: no script, frame, form or svg, no on* attributes, no javascript:/data: links, no inline styles', () => {
    // The payloads are live in marked's own output, so the check below has something to catch.
    expect(dangers(new Marked().parse(XSS) as string, { styles: true }).length).toBeGreaterThanOrEqual(8)
    const html = renderMarkdownSafe(XSS)
    expect(dangers(html, { styles: true })).toEqual([])
    expect(html).not.toMatch(/<script/i)
    expect(html).toContain('link') // the harmless text of the links survives
  })
  it('the same payload in an e-mail body is neutralised in the whole HTML e-mail', () => {
    for (const kind of ['reply', 'info-requested'] as const) {
      const e = render(kind, { body: XSS })
      expect(dangers(e.html, { styles: false })).toEqual([])
    }
    const plan = render('plan-sent', { summary: XSS })
    expect(dangers(plan.html, { styles: false })).toEqual([])
  })
  it('does not change text without markup beyond wrapping it in a paragraph', () => {
    expect(renderMarkdownSafe('Room 5.2 m long')).toBe('<p>Room 5.2 m long</p>\n')
  })
})
