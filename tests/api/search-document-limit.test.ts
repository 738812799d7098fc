/**
 * The case's search document (cases.messages_search, migrations 0101 and 0102) must never stop a thread.
 * A tsvector has to stay under 1 MB (PostgreSQL 15 manual, 8.11.1 "tsvector"); a thread of pasted
 * measurement tables, every number its own lexeme, gets there in a few dozen messages. Past the bound the
 * new words are left out of the search; the messages are still taken, and the case can still be changed.
 */
import { afterAll, describe, expect, it } from 'vitest'
import { randomBytes } from 'node:crypto'

const { closeTestApp, signedIn } = await import('../helpers/api')
const { openCase } = await import('../helpers/cases')
const { models } = await import('../../server/db/models')

afterAll(closeTestApp)

/** About 20 000 characters of words no dictionary has: each one a lexeme of its own in the document. */
const pastedTable = () => Array.from({ length: 2300 }, () => `q${randomBytes(4).toString('hex')}`).join(' ')

describe('a case whose search document is full', () => {
  it('keeps taking messages, one at a time and many in one statement, and its case can still be changed', async () => {
    const listener = await signedIn('listener')
    const advisor = await signedIn('advisor')
    const { case: c } = await openCase(listener.c, { title: 'Pasted measurement tables' })
    const { Message, Case } = models()
    // one at a time, as posted: past ~40 of these the document would be over 1 MB
    for (let i = 0; i < 45; i++) await Message.create({ caseId: c.id, authorId: listener.user.id, body: pastedTable() })
    // and many in one statement (a bulk import), whose batch alone is over the limit
    await Message.bulkCreate(Array.from({ length: 60 }, () => ({ caseId: c.id, authorId: listener.user.id, body: pastedTable() })))
    const row = await Case.findByPk(c.id, { attributes: ['id'], raw: true })
    expect(row).not.toBeNull()

    await listener.c.post(`/api/cases/${c.id}/messages`, { body: 'The harpsichordist hears it too' }).expect(201)
    // a change of the case row recomputes its generated search_all: it must still fit
    await advisor.c.patch(`/api/cases/${c.id}`, { assigneeId: advisor.user.id }).expect(200)
    const thread = (await advisor.c.get(`/api/cases/${c.id}/messages`).expect(200)).body.messages as { body: string }[]
    expect(thread.at(-1)?.body).toBe('The harpsichordist hears it too')
    expect(thread.length).toBe(106)
    // the title and description are still found (the document's own part)
    const found = (await advisor.c.get('/api/cases?q=pasted%20measurement&scope=all').expect(200)).body.rows as { id: string }[]
    expect(found.map((r) => r.id)).toContain(c.id)
  }, 120_000)
})
