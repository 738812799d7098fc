import { QueryTypes } from 'sequelize'
import { db } from '../../db/sequelize'
import { findUserByEmail, toPublicUser } from '../../data/users'
import { createSnippet } from '../../services/snippets'
import { snippetSchema } from '../../../shared/schemas/snippet'
import { demoSnippets } from '../snippets'

/** The demo team's shared snippets (written by Teodor), each checked like one an advisor saves; titles the team already has are left alone. */
export async function seed(): Promise<void> {
  const u = await findUserByEmail('advisor@roomwright.test')
  if (!u) return
  const author = toPublicUser(u)
  for (const s of demoSnippets) {
    const taken = await db().query(`SELECT 1 FROM reply_snippets WHERE scope = 'team' AND lower(title) = lower($1)`, { bind: [s.title], type: QueryTypes.SELECT })
    if (!taken.length) await createSnippet(author, snippetSchema.parse({ ...s, scope: 'team' }))
  }
}
