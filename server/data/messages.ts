import { Op, type Transaction } from 'sequelize'
import { models, type MessageModel, type Viewer } from '../db/models'

export async function insertMessage(m: { caseId: string; authorId: string | null; body: string; internal: boolean; source: 'app' | 'email' }, t: Transaction): Promise<string> {
  return (await models().Message.create(m, { transaction: t })).id
}

/** The thread as `viewer` may see it (scope `visibleTo`: internal notes only for the team), oldest first. */
export async function listMessages(caseId: string, viewer: Viewer, onlyId?: string, t?: Transaction): Promise<MessageModel[]> {
  const { Message, File } = models()
  return Message.scope(['thread', { method: ['visibleTo', viewer] }]).findAll({
    where: { caseId, ...(onlyId ? { id: onlyId } : {}) },
    order: [['createdAt', 'ASC'], ['id', 'ASC'], [{ model: File, as: 'files' }, 'createdAt', 'ASC']],
    transaction: t,
  })
}

/** Links uploaded files of the case to a message; the number linked (files already on a message are left alone). */
export async function attachFilesToMessage(caseId: string, messageId: string, fileIds: string[], t: Transaction): Promise<number> {
  const [n] = await models().File.update({ messageId }, { where: { caseId, id: { [Op.in]: fileIds }, messageId: null }, transaction: t })
  return n
}
