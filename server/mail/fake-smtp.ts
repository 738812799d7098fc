import type { AddressInfo } from 'node:net'
import { SMTPServer, type SMTPServerSession } from 'smtp-server'
import { simpleParser, type ParsedMail } from 'mailparser'
import { config } from '../config'
import { log } from '../lib/log'
import { storeReceived } from './mailbox'
import { extractReplyToken, handleInboundEmail, type InboundEmail } from './inbound'

export interface FakeSmtp {
  port: number
  stop: () => Promise<void>
}

const LOOPBACK = new Set(['127.0.0.1', '::1', 'localhost'])
const isLoopbackPeer = (a: string) => a === '127.0.0.1' || a === '::1' || a.startsWith('127.') || a === '::ffff:127.0.0.1' || a.startsWith('::ffff:127.')
export const FAKE_SMTP_MAX_BYTES = 25 * 1024 * 1024

function headerValue(v: unknown): string | string[] {
  if (v == null) return ''
  if (typeof v === 'string') return v
  if (v instanceof Date) return v.toISOString()
  if (Array.isArray(v)) return v.map((x) => String(headerValue(x)))
  if (typeof v === 'object') {
    const o = v as { text?: string; value?: unknown; params?: Record<string, string> }
    if (typeof o.text === 'string') return o.text // an address header
    if (typeof o.value === 'string') {
      const params = Object.entries(o.params ?? {}).map(([k, p]) => `; ${k}=${p}`).join('')
      return o.value + params
    }
  }
  return String(v)
}

function headersOf(parsed: ParsedMail): Record<string, string | string[]> {
  const out: Record<string, string | string[]> = {}
  for (const [k, v] of parsed.headers) out[k] = headerValue(v)
  return out
}

const firstAddress = (a: ParsedMail['from']) => (a && !Array.isArray(a) ? a.value[0]?.address : undefined)

/**
 * The local stand-in for a mail server: accepts every message on loopback (no authentication),
 * keeps it in dev_mailbox for the mailbox page, and hands a message sent to a case's reply address
 * (reply+<token>@MAIL_REPLY_DOMAIN, by envelope recipient) to the inbound handler, as a provider's
 * inbound webhook would in production.
 */
export async function startFakeSmtp(opts: { port?: number; host?: string; inbound?: (mail: InboundEmail) => Promise<unknown> } = {}): Promise<FakeSmtp> {
  const host = opts.host ?? '127.0.0.1'
  if (!LOOPBACK.has(host)) throw new RangeError(`the fake SMTP server listens on loopback only, not on ${host}`)
  const inbound = opts.inbound ?? ((mail: InboundEmail) => handleInboundEmail(mail, { via: 'smtp' }))

  const server = new SMTPServer({
    name: 'roomwright-fake-smtp',
    banner: 'Roomwright local mail catcher',
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    size: FAKE_SMTP_MAX_BYTES,
    closeTimeout: 2000,
    logger: false,
    onConnect(session: SMTPServerSession, cb: (err?: Error) => void) {
      if (!isLoopbackPeer(session.remoteAddress)) return cb(Object.assign(new Error('Loopback connections only'), { responseCode: 554 }))
      cb()
    },
    onData(stream, session, cb) {
      const chunks: Buffer[] = []
      stream.on('data', (c: Buffer) => chunks.push(c))
      stream.on('error', (e) => cb(e))
      stream.on('end', () => {
        if (stream.sizeExceeded) return cb(Object.assign(new Error('Message too large'), { responseCode: 552 }))
        const raw = Buffer.concat(chunks)
        void received(raw, session).then(
          () => cb(),
          (e) => {
            log.error('fake SMTP could not keep a message', { err: String(e) })
            cb(Object.assign(new Error('Temporary local problem; try again'), { responseCode: 451 }))
          },
        )
      })
    },
  })

  async function received(raw: Buffer, session: SMTPServerSession) {
    const parsed = await simpleParser(raw)
    const envelopeTo = session.envelope.rcptTo.map((r) => r.address)
    const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : null
    const headers = headersOf(parsed)
    await storeReceived({
      messageId: parsed.messageId ?? null,
      envelopeFrom,
      envelopeTo,
      subject: parsed.subject ?? '',
      text: parsed.text ?? null,
      html: typeof parsed.html === 'string' ? parsed.html : null,
      headers,
      rawSize: raw.length,
    })
    for (const rcpt of envelopeTo) {
      if (!extractReplyToken(rcpt)) continue
      const auto = headers['auto-submitted']
      await inbound({
        to: rcpt,
        from: firstAddress(parsed.from) ?? envelopeFrom ?? '',
        subject: parsed.subject ?? '',
        text: parsed.text ?? undefined,
        html: typeof parsed.html === 'string' ? parsed.html : undefined,
        autoSubmitted: Array.isArray(auto) ? auto[0] : auto || undefined,
        messageId: parsed.messageId ?? undefined,
        date: parsed.date ? parsed.date.toISOString() : undefined,
      })
    }
  }

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(opts.port ?? 0, host, () => {
      server.off('error', reject)
      resolve()
    })
  })
  server.on('error', (e) => log.warn('fake SMTP error', { err: String(e) }))
  const port = (server.server.address() as AddressInfo).port
  let stopping: Promise<void> | undefined
  return {
    port,
    stop: () => (stopping ??= new Promise<void>((resolve) => server.close(() => resolve()))),
  }
}

/** Starts the fake on SMTP_PORT when FAKE_SMTP is on (what `npm start` does on its embedded defaults); null otherwise. */
export async function maybeStartFakeSmtp(): Promise<FakeSmtp | null> {
  const c = config()
  if (c.FAKE_SMTP !== 'on') return null
  if (!LOOPBACK.has(c.SMTP_HOST)) log.warn('FAKE_SMTP is on but SMTP_HOST is not loopback; outgoing mail will not reach the fake', { host: c.SMTP_HOST })
  const fake = await startFakeSmtp({ port: c.SMTP_PORT, host: '127.0.0.1' })
  log.info('fake SMTP server listening', { port: fake.port })
  return fake
}
