import { createHash } from 'node:crypto'

/** What identifies one inbound e-mail: its Message-ID when it has one, else its headers and text. */
export interface InboundIdentityParts {
  messageId?: string
  from: string
  subject?: string
  date?: string
  text?: string
  html?: string
}

const sha256 = (s: string) => createHash('sha256').update(s, 'utf8').digest('hex')

/**
 * The Message-ID without its angle brackets and folding whitespace (RFC 5322 §3.6.4: `msg-id = "<" id-left
 * "@" id-right ">"`, with optional comments and folding around it); empty when nothing usable is left. The
 * case of the letters is kept: the standard does not make the id-left case-insensitive.
 */
export function normaliseMessageId(raw: string | undefined): string {
  if (!raw) return ''
  const flat = raw.replace(/\s+/g, ' ').trim()
  const inAngles = /<([^<>]+)>/.exec(flat)?.[1]
  return (inAngles ?? flat).replace(/\s+/g, '').slice(0, 998)
}

const oneLine = (s: string | undefined) => (s ?? '').replace(/\s+/g, ' ').trim()
const textBlock = (s: string | undefined) => (s ?? '').replace(/\r\n?/g, '\n').split('\n').map((l) => l.replace(/\s+$/, '')).join('\n').trim()
const normalDate = (s: string | undefined) => {
  const t = Date.parse(oneLine(s))
  return Number.isNaN(t) ? oneLine(s) : new Date(t).toISOString()
}

/**
 * The key under which a case remembers an e-mail (inbound_email_receipts, migration 0100):
 * `mid:` + SHA-256 of the normalised Message-ID; for a message without one (RFC 5322 only says SHOULD),
 * `sum:` + SHA-256 of its normalised From address, Subject and Date and its text (or HTML when it has no
 * text) — line ends and trailing spaces do not matter, so the same message through SMTP and through the
 * webhook gives one key. The fallback's price: the same words sent twice to one case, without a Message-ID
 * and without a Date header, count as one e-mail.
 */
export function inboundMessageKey(mail: InboundIdentityParts, fromAddress: string | null): string {
  const id = normaliseMessageId(mail.messageId)
  if (id) return `mid:${sha256(id)}`
  const parts = [
    (fromAddress ?? oneLine(mail.from)).toLowerCase(),
    oneLine(mail.subject),
    normalDate(mail.date),
    mail.text?.trim() ? textBlock(mail.text) : '',
    mail.text?.trim() ? '' : textBlock(mail.html),
  ]
  return `sum:${sha256(JSON.stringify(parts))}`
}
