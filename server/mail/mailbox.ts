import { QueryTypes } from 'sequelize'
import { db } from '../db/sequelize'

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
  const [row] = await db().query<{ id: string }>(
    `INSERT INTO dev_mailbox (message_id, envelope_from, envelope_to, subject, text, html, headers, raw_size)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8) RETURNING id`,
    { bind: [m.messageId, m.envelopeFrom, m.envelopeTo, m.subject, m.text, m.html, JSON.stringify(m.headers), m.rawSize], type: QueryTypes.SELECT },
  )
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
