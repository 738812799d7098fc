import { timingSafeEqual } from 'node:crypto'
import { JSDOM } from 'jsdom'
import { config } from '../config'
import { models } from '../db/models'
import { AppError } from '../errors'
import { log } from '../lib/log'
import { receiveEmailReply } from '../services/messages'
import { insertMessage } from '../data/messages'
import { insertEvent } from '../data/events'
import { withTransaction } from '../db/transaction'
import { publishCase } from '../services/live'
import { AlreadyReceived, claimReceipt, findReceipt, type Receipt } from '../data/inbound-receipts'
import { REPLY_MARKER } from './templates'
import { inboundMessageKey } from './inbound-identity'

/** An e-mail sent to a case's reply address, from the fake SMTP server or a provider's inbound webhook. */
export interface InboundEmail {
  /** The recipient(s): an address, "Name <address>", a comma-separated list, or an array of these. */
  to: string | string[]
  from: string
  subject?: string
  text?: string
  html?: string
  /** The Auto-Submitted header when known (RFC 3834); anything but "no" marks an automatic reply. */
  autoSubmitted?: string
  /**
   * The receiving mail server's verdict on the sender, as an Authentication-Results header value
   * (RFC 8601), when the provider passes it on. A From address is only a claim (RFC 5322 lets anyone
   * write any): a reply whose DMARC check failed, or whose SPF failed with no passing DKIM signature,
   * is held for the team like one from a stranger.
   */
  authenticationResults?: string
  /**
   * The Message-ID header (RFC 5322 §3.6.4), as the provider or the SMTP server received it: the same
   * e-mail delivered twice to one case is taken in once (./inbound-identity.ts; without one, a hash of
   * the normalised headers and text stands in).
   */
  messageId?: string
  /** The Date header, when known: part of the fallback identity of an e-mail without a Message-ID. */
  date?: string
}

/**
 * Whether an Authentication-Results value (RFC 8601 §2.2: `authserv-id; method=result …`) says the
 * sender is forged: dmarc=fail (RFC 7489), or spf=fail (RFC 7208 §2.6.4) without any dkim=pass (RFC 6376).
 * No value, or only neutral/none/softfail results, is not a failure (many providers pass nothing).
 */
export function senderFailsAuthentication(results: string | undefined): boolean {
  if (!results) return false
  const verdicts = [...results.toLowerCase().matchAll(/\b(dmarc|spf|dkim)\s*=\s*([a-z]+)/g)].map((m) => `${m[1]}=${m[2]}`)
  if (verdicts.includes('dmarc=fail')) return true
  return verdicts.includes('spf=fail') && !verdicts.includes('dkim=pass')
}

export type InboundRejection = 'no_reply_address' | 'unknown_token' | 'sender_mismatch' | 'sender_unverified' | 'listener_inactive' | 'auto_reply' | 'empty_reply' | `case_${string}`
export type InboundResult = { accepted: true; caseId: string; messageId?: string; duplicate?: true } | { accepted: false; reason: InboundRejection }
/** Appends the reply; with `messageKey`, it records the e-mail's receipt in the same transaction (claimReceipt). */
export type AppendReply = (input: { caseId: string; userId: string; body: string; messageKey?: string }) => Promise<{ id?: string } | unknown>

const TOKEN = /^[A-Za-z0-9_-]{16,64}$/
const MAX_BODY = 20_000

function rawAddress(s: string): string | null {
  const angle = /<\s*([^<>\s]+@[^<>\s]+)\s*>/.exec(s)
  return angle ? angle[1] : (/([^\s<>,;"]+@[^\s<>,;"]+)/.exec(s)?.[1] ?? null)
}

/** The bare address in `Name <a@b>` or `a@b`, lower-cased; null when there is none. */
export function parseAddress(s: string): string | null {
  return rawAddress(String(s ?? ''))?.toLowerCase() ?? null
}

function addresses(to: string | string[]): string[] {
  // Split on commas and semicolons that are not inside a quoted display name.
  const parts = (Array.isArray(to) ? to : [to]).flatMap((t) => String(t ?? '').split(/[,;](?=(?:[^"]*"[^"]*")*[^"]*$)/))
  return parts.map(rawAddress).filter((a): a is string => !!a)
}

/** The token of the first recipient of the form reply+<token>@<domain> (domain in any case); null when there is none. */
export function extractReplyToken(to: string | string[], domain = config().MAIL_REPLY_DOMAIN): string | null {
  const d = domain.toLowerCase()
  for (const a of addresses(to)) {
    const at = a.lastIndexOf('@')
    if (a.slice(at + 1).toLowerCase() !== d) continue
    const m = /^reply\+(.+)$/i.exec(a.slice(0, at))
    if (m && TOKEN.test(m[1])) return m[1]
  }
  return null
}

// ---------------------------------------------------------------- quoted history

const REPLY_HEADER = [
  /^On\s.*(\d|@).*\bwrote:$/i, // Gmail, Apple Mail, Thunderbird: "On Tue, 4 Jun 2024 at 09:12, Roomwright <…> wrote:"
  /^Le\s.*(\d|@).*a écrit\s?:$/i, // French clients
  /^Am\s.*(\d|@).*schrieb.*:$/i, // German clients
  /^El\s.*(\d|@).*escribió:$/i, // Spanish clients
  /^Op\s.*(\d|@).*schreef.*:$/i, // Dutch clients
]
const SEPARATOR = [
  /^-{2,}\s*Original Message\s*-{2,}$/i, // Outlook desktop
  /^-{2,}\s*Forwarded message\s*-{2,}$/i, // Gmail forward
  /^Begin forwarded message:$/i, // Apple Mail forward
  /^_{10,}$/, // Outlook's rule above its From:/Sent: block
  /^(Sent from my \w[\w ]*|Sent from (Mail|Outlook) for \w+|Get Outlook for \w+)\.?$/i, // mobile footers
]
const markerText = REPLY_MARKER.toLowerCase()

function isCut(line: string, raw: string, next: string | undefined, nextNext: string | undefined): boolean {
  if (raw === '-- ' || raw.trimEnd() === '--') return true // signature separator, RFC 3676 §4.3
  if (line.toLowerCase().includes(markerText)) return true
  if (SEPARATOR.some((r) => r.test(line))) return true
  if (REPLY_HEADER.some((r) => r.test(line))) return true
  // A reply header wrapped onto two lines ("On Tue, 4 Jun 2024 at 09:12, Roomwright <" + "reply+…> wrote:").
  if (next !== undefined && /^(On|Le|Am|El|Op)\s/.test(line) && REPLY_HEADER.some((r) => r.test(`${line} ${next}`))) return true
  // Outlook's header block of the quoted message: "From: …" followed by "Sent:" or "Date:".
  if (/^\*?From:\*?\s/i.test(line) && next !== undefined && (/^\*?(Sent|Date):\*?\s/i.test(next) || /^\*?(Sent|Date):\*?\s/i.test(nextNext ?? ''))) return true
  return false
}

/**
 * The listener's own words from a reply: everything above the first sign of the quoted history.
 * Cuts at our reply marker, an "On … wrote:" line (one line or wrapped onto two, also in French,
 * German, Spanish and Dutch), an Outlook "-----Original Message-----" or "From:/Sent:" block, a
 * forward header, the signature separator "-- " (RFC 3676 §4.3) and common mobile footers; drops
 * every line quoted with ">" (so answers written between quoted lines are kept); trims blank lines.
 */
export function stripQuotedReply(raw: string): string {
  const lines = raw.replace(/\r\n?/g, '\n').replace(/\u00a0/g, ' ').split('\n')
  const out: string[] = []
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i].trim()
    if (isCut(line, lines[i], lines[i + 1]?.trim(), lines[i + 2]?.trim())) break
    if (line.startsWith('>')) continue
    out.push(lines[i].replace(/\s+$/, ''))
  }
  return out.join('\n').replace(/\n{3,}/g, '\n\n').trim()
}

/** Plain text from an HTML-only reply, without the quoted parts mail clients mark up as such. */
export function htmlToReplyText(html: string): string {
  const { document } = new JSDOM(html).window
  document.querySelectorAll('blockquote, .gmail_quote, #divRplyFwdMsg, #appendonsend, [type="cite"], style, script, head').forEach((n) => n.remove())
  document.querySelectorAll('br').forEach((n) => n.replaceWith('\n'))
  document.querySelectorAll('p, div, li, tr, h1, h2, h3, h4, h5, h6').forEach((n) => n.append('\n'))
  return document.body?.textContent ?? ''
}

// ---------------------------------------------------------------- handling

async function logInbound(via: 'smtp' | 'webhook', mail: InboundEmail, status: 'accepted' | 'rejected', reason: string | null, caseId: string | null) {
  await models().InboundEmailLog.create({
    via, status, reason, caseId,
    toAddress: (Array.isArray(mail.to) ? mail.to.join(', ') : String(mail.to ?? '')).slice(0, 2000),
    fromAddress: String(mail.from ?? '').slice(0, 500),
    subject: (mail.subject ?? '').slice(0, 500),
  })
  if (status === 'rejected') log.warn('inbound e-mail rejected', { via, reason, from: mail.from })
}

/**
 * A reply to a case's address from someone who is not the case's listener: never posted as the
 * listener. It is kept on the case as an internal note (staff only, ../data/visibility.ts) with an
 * internal history entry, so the advisor sees it and can decide what to do.
 */
async function holdForTeam(caseId: string, mail: InboundEmail, sender: string | null, messageKey: string, why: 'stranger' | 'unverified' = 'stranger'): Promise<void> {
  const text = stripQuotedReply(mail.text?.trim() ? mail.text : mail.html ? htmlToReplyText(mail.html) : '').slice(0, 4000)
  const from = (sender ?? String(mail.from ?? '')).slice(0, 200).replace(/[`\r\n]/g, ' ')
  const body = [
    why === 'stranger'
      ? `**E-mail held for the team.** A reply to this case's address came from \`${from || 'an unknown sender'}\`, which is not the listener's address, so it was not added as the listener's message.`
      : `**E-mail held for the team.** A reply to this case's address claims to come from the listener (\`${from}\`), but the receiving mail server found the sender forged (SPF/DMARC failed), so it was not added as the listener's message.`,
    mail.subject ? `Subject: ${mail.subject.slice(0, 300).replace(/[\r\n]+/g, ' ')}` : '',
    text ? text.split('\n').map((l) => `> ${l}`).join('\n') : '_(no text)_',
  ].filter(Boolean).join('\n\n')
  await withTransaction(async (t, afterCommit) => {
    const messageId = await insertMessage({ caseId, authorId: null, body, internal: true, source: 'email' }, t)
    await claimReceipt({ caseId, messageKey, messageId, outcome: why === 'stranger' ? 'sender_mismatch' : 'sender_unverified' }, t)
    const seq = await insertEvent({ caseId, actorId: null, kind: 'email-held', data: { messageId, internal: true, from } }, t)
    afterCommit(() => {
      publishCase(caseId, { type: 'case.message', caseId, messageId, internal: true }, { internal: true })
      publishCase(caseId, { type: 'case.event', caseId, seq, kind: 'email-held', internal: true }, { internal: true })
    })
  })
}

function sameToken(a: string, b: string): boolean {
  const x = Buffer.from(a)
  const y = Buffer.from(b)
  return x.length === y.length && timingSafeEqual(x, y)
}

/**
 * Appends a reply received by e-mail to its case as the listener's message. Rejected (and logged in
 * inbound_email_log) when no recipient is a reply address, the token matches no case, the sender is
 * not the case's listener, the message is an automatic reply, nothing is left after the quoted
 * history is stripped, or the case refuses the message (closed, say). An e-mail the case already took
 * in (same Message-ID, or without one the same normalised headers and text: ./inbound-identity.ts) adds
 * nothing and gets its first answer again: accepted with `duplicate` and the first message's id, or the
 * same held-for-the-team rejection (inbound_email_receipts, migration 0100, unique per case).
 */
export async function handleInboundEmail(mail: InboundEmail, opts: { via?: 'smtp' | 'webhook'; append?: AppendReply } = {}): Promise<InboundResult> {
  const via = opts.via ?? 'webhook'
  const append = opts.append ?? receiveEmailReply
  const reject = async (reason: InboundRejection, caseId: string | null = null): Promise<InboundResult> => {
    await logInbound(via, mail, 'rejected', reason, caseId)
    return { accepted: false, reason }
  }

  const token = extractReplyToken(mail.to)
  if (!token) return reject('no_reply_address')
  const c = await models().Case.findOne({
    attributes: ['id', 'replyToken', 'listenerId'],
    where: { replyToken: token },
    include: [{ association: 'listener', attributes: ['email', 'active'], required: true }],
  })
  if (!c || !sameToken(c.replyToken, token)) return reject('unknown_token')
  const sender = parseAddress(mail.from ?? '')

  // The same e-mail again (a provider's retry, a replay, SMTP delivering twice): the first answer, nothing added.
  const messageKey = inboundMessageKey(mail, sender)
  const again = async (receipt: Receipt): Promise<InboundResult> => {
    if (receipt.outcome !== 'posted') return reject(receipt.outcome, c.id)
    await logInbound(via, mail, 'accepted', 'duplicate', c.id)
    return { accepted: true, caseId: c.id, ...(receipt.messageId ? { messageId: receipt.messageId } : {}), duplicate: true }
  }
  const seen = await findReceipt(c.id, messageKey)
  if (seen) return again(seen)
  const hold = async (why: 'stranger' | 'unverified'): Promise<InboundResult> => {
    try {
      await holdForTeam(c.id, mail, sender, messageKey, why)
    } catch (e) {
      if (e instanceof AlreadyReceived) return again(e.receipt)
      throw e
    }
    return reject(why === 'stranger' ? 'sender_mismatch' : 'sender_unverified', c.id)
  }

  if (!sender || sender !== c.listener!.email.toLowerCase()) return hold('stranger')
  if (senderFailsAuthentication(mail.authenticationResults)) return hold('unverified')
  // a switched-off account may not write through the web, so not by e-mail either
  if (!c.listener!.active) return reject('listener_inactive', c.id)
  if (mail.autoSubmitted && mail.autoSubmitted.trim().toLowerCase() !== 'no') return reject('auto_reply', c.id)

  const source = mail.text?.trim() ? mail.text : mail.html ? htmlToReplyText(mail.html) : ''
  const stripped = stripQuotedReply(source)
  if (!stripped) return reject('empty_reply', c.id)
  // A thread message holds at most 20 000 characters (messageSchema in shared/schemas/case.ts).
  const body = stripped.length > MAX_BODY ? `${stripped.slice(0, MAX_BODY - 40).trimEnd()}\n\n[… shortened: the e-mail was longer]` : stripped

  let appended: unknown
  try {
    appended = await append({ caseId: c.id, userId: c.listenerId, body, messageKey })
  } catch (e) {
    if (e instanceof AlreadyReceived) return again(e.receipt)
    if (e instanceof AppError && e.status < 500) return reject(`case_${e.code}`.slice(0, 40) as InboundRejection, c.id)
    throw e
  }
  await logInbound(via, mail, 'accepted', null, c.id)
  const messageId = (appended as { id?: unknown } | undefined)?.id
  return { accepted: true, caseId: c.id, ...(typeof messageId === 'string' ? { messageId } : {}) }
}
