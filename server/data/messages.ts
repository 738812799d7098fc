import { Op, type Transaction } from 'sequelize'
import { models, type MessageModel } from '../db/models'
import type { Audience } from './visibility'

export async function insertMessage(m: { caseId: string; authorId: string | null; body: string; internal: boolean; source: 'app' | 'email' }, t: Transaction): Promise<string> {
  return (await models().Message.create(m, { transaction: t })).id
}

/** The thread as `viewer` may see it (scope `visibleTo`, the rule of ./visibility.ts), oldest first. */
export async function listMessages(caseId: string, audience: Audience, onlyId?: string, t?: Transaction): Promise<MessageModel[]> {
  const { Message, File } = models()
  return Message.scope(['thread', { method: ['visibleTo', audience] }]).findAll({
    where: { caseId, ...(onlyId ? { id: onlyId } : {}) },
    order: [['createdAt', 'ASC'], ['id', 'ASC'], [{ model: File, as: 'files' }, 'createdAt', 'ASC']],
    transaction: t,
  })
}

/** Links the uploader's own unattached files of the case to a message; the number linked. */
export async function attachFilesToMessage(caseId: string, messageId: string, uploaderId: string, fileIds: string[], t: Transaction): Promise<number> {
  const [n] = await models().File.update({ messageId }, { where: { caseId, id: { [Op.in]: fileIds }, messageId: null, uploaderId }, transaction: t })
  return n
}
