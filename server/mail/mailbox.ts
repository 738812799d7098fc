import { QueryTypes } from 'sequelize'
import { db } from '../db/sequelize'
import { models } from '../db/models'

/** A message the local fake SMTP server received, as the mailbox page shows it. */
export interface MailboxMessage {
  id: number
  messageId: string | null
  envelopeFrom: string | null
  envelopeTo: string[]
  subject: string
  text: string | null
  html: string | null
  headers: Record<string, string | string[]>
  rawSize: number
  receivedAt: string
}

export async function storeReceived(m: Omit<MailboxMessage, 'id' | 'receivedAt'>): Promise<number> {
  const row = await models().DevMailbox.create({
    messageId: m.messageId, envelopeFrom: m.envelopeFrom, envelopeTo: m.envelopeTo, subject: m.subject, text: m.text, html: m.html, headers: m.headers, rawSize: m.rawSize,
  })
  return Number(row.id)
}

interface Row {
  id: string
  message_id: string | null
  envelope_from: string | null
  envelope_to: string[]
  subject: string
  text: string | null
  html: string | null
  headers: Record<string, string | string[]>
  raw_size: number
  received_at: Date
}

/** Newest first; `to` filters on an envelope recipient (exact, any letter case). */
export async function listMailbox(opts: { limit?: number; before?: number; to?: string } = {}): Promise<MailboxMessage[]> {
  // raw SQL: a case-insensitive match against any element of a text[] column (unnest) has no ORM form
  const rows = await db().query<Row>(
    `SELECT * FROM dev_mailbox
      WHERE ($1::bigint IS NULL OR id < $1)
        AND ($2::text IS NULL OR lower($2) = ANY (SELECT lower(x) FROM unnest(envelope_to) x))
      ORDER BY id DESC LIMIT $3`,
    { bind: [opts.before ?? null, opts.to ?? null, Math.min(Math.max(opts.limit ?? 50, 1), 200)], type: QueryTypes.SELECT },
  )
  return rows.map((r) => ({
    id: Number(r.id),
    messageId: r.message_id,
    envelopeFrom: r.envelope_from,
    envelopeTo: r.envelope_to,
    subject: r.subject,
    text: r.text,
    html: r.html,
    headers: r.headers,
    rawSize: r.raw_size,
    receivedAt: new Date(r.received_at).toISOString(),
  }))
}
