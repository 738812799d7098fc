import { Op, col, fn, where } from 'sequelize'
import { models } from '../../db/models'
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
    const taken = await models().ReplySnippet.count({ where: { [Op.and]: [{ scope: 'team' }, where(fn('lower', col('title')), Op.eq, fn('lower', s.title))] } })
    if (!taken) await createSnippet(author, snippetSchema.parse({ ...s, scope: 'team' }))
  }
}
