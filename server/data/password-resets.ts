import { Op, fn, type Transaction } from 'sequelize'
import { passwordResetTokenModel } from '../db/models/password-reset-token'

export interface ResetTokenRecord { id: string; userId: string; createdAt: Date; expiresAt: Date; spentAt: Date | null }
const plain = (r: { id: string; userId: string; createdAt: Date; expiresAt: Date; spentAt: Date | null }): ResetTokenRecord =>
  ({ id: r.id, userId: r.userId, createdAt: r.createdAt, expiresAt: r.expiresAt, spentAt: r.spentAt })

/** How many reset links were made for the account since `since` (the per-account limit). */
export async function countResetTokensSince(userId: string, since: Date, t?: Transaction): Promise<number> {
  return passwordResetTokenModel().count({ where: { userId, createdAt: { [Op.gte]: since } }, transaction: t })
}

/** Spends every open link of the account (a newer one replaces them; a reset spends all). */
export async function spendResetTokens(userId: string, t?: Transaction): Promise<void> {
  await passwordResetTokenModel().update({ spentAt: fn('now') as unknown as Date }, { where: { userId, spentAt: null }, transaction: t })
}

export async function insertResetToken(input: { userId: string; tokenHash: string; expiresAt: Date }, t?: Transaction): Promise<ResetTokenRecord> {
  return plain(await passwordResetTokenModel().create({ ...input, spentAt: null }, { transaction: t }))
}

/** The link with this token hash, locked for its one use. */
export async function findResetTokenForUse(tokenHash: string, t: Transaction): Promise<ResetTokenRecord | null> {
  const r = await passwordResetTokenModel().findOne({ where: { tokenHash }, transaction: t, lock: t.LOCK.UPDATE })
  return r ? plain(r) : null
}
