import type { Transaction } from 'sequelize'
import { models } from '../db/models'

/**
 * THE visibility rule of a case's thread — the one place that says what the case's listener may see
 * of its messages, files and history. Advisors and supervisors see everything of a case they may read;
 * the listener sees only what is shared with them:
 *
 * - a **message** is shared unless it is an internal note;
 * - a **file** is shared when it is attached to a shared message, or when the listener uploaded it
 *   themselves and it is attached to nothing (yet). A file the team uploaded stays with the team until
 *   it goes out with a reply; a file attached to an internal note never leaves the team;
 * - an **event** is shared unless it is marked internal, or it names a message or a file that is not
 *   shared (so the history never shows an internal note's attachment by name, even after the fact).
 *
 * Every read path (thread, file list, download, thumbnail, history, socket catch-up and live payloads)
 * goes through these fragments, so the rule cannot drift between them. Written as SQL predicates over
 * a table alias so each ports to one Sequelize scope (`where: literal(sharedWithListener.file('files'))`).
 */
const messageShared = (m: string) => `(NOT ${m}.internal)`
const fileShared = (f: string) =>
  `((${f}.message_id IS NULL AND ${f}.uploader_id = (SELECT lc.listener_id FROM cases lc WHERE lc.id = ${f}.case_id))
    OR EXISTS (SELECT 1 FROM messages sm WHERE sm.id = ${f}.message_id AND ${messageShared('sm')}))`
const eventShared = (e: string) =>
  `(NOT coalesce((${e}.data->>'internal')::boolean, false)
    AND (${e}.data->>'messageId' IS NULL OR EXISTS (SELECT 1 FROM messages em WHERE em.case_id = ${e}.case_id AND em.id::text = ${e}.data->>'messageId' AND ${messageShared('em')}))
    AND (${e}.data->>'fileId' IS NULL OR EXISTS (SELECT 1 FROM files ef WHERE ef.case_id = ${e}.case_id AND ef.id::text = ${e}.data->>'fileId' AND ${fileShared('ef')})))`

export const sharedWithListener = { message: messageShared, file: fileShared, event: eventShared } as const

/** Who is looking: the team sees everything of a readable case, the listener only what is shared. */
export type Audience = 'team' | 'listener'

/** `kind`'s rows under `alias` that `audience` may see: a SQL predicate (always true for the team). */
export function visibleTo(audience: Audience, kind: keyof typeof sharedWithListener, alias: string): string {
  return audience === 'team' ? 'TRUE' : sharedWithListener[kind](alias)
}

/** Whether a file is for the team only right now (decides where its live notifications go). */
export async function fileIsTeamOnly(fileId: string, t?: Transaction): Promise<boolean> {
  const shared = await models().File.scope({ method: ['visibleTo', 'listener'] }).count({ where: { id: fileId }, transaction: t })
  return shared === 0
}
