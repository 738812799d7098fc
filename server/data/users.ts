import { Op, fn, col, where, type Transaction } from 'sequelize'
import { userModel, type UserModel } from '../db/models/user'
import type { Role, User } from '../../shared/schemas/auth'

export interface UserRecord extends User {
  passwordHash: string | null
  active: boolean
  units: 'metric' | 'imperial'
  emailOptional: boolean
  createdAt: Date
}

const toRecord = (u: UserModel): UserRecord => ({
  id: u.id,
  email: u.email,
  name: u.name,
  role: u.role,
  passwordHash: u.passwordHash,
  active: u.active,
  units: u.units,
  emailOptional: u.emailOptional,
  createdAt: u.createdAt,
})

export const toPublicUser = (u: UserRecord): User => ({ id: u.id, email: u.email, name: u.name, role: u.role })

export async function findUserByEmail(email: string): Promise<UserRecord | null> {
  const u = await userModel().findOne({ where: where(fn('lower', col('email')), email.toLowerCase()) })
  return u ? toRecord(u) : null
}

export async function findUserById(id: string): Promise<UserRecord | null> {
  const u = await userModel().findByPk(id)
  return u ? toRecord(u) : null
}

export async function insertUser(input: { email: string; name: string; role: Role; passwordHash: string | null }): Promise<UserRecord> {
  return toRecord(await userModel().create(input))
}

export async function listUsers(roles: Role[]): Promise<UserRecord[]> {
  const rows = await userModel().findAll({ where: { role: { [Op.in]: roles } }, order: [['name', 'ASC']] })
  return rows.map(toRecord)
}

export async function updateUser(id: string, patch: Partial<Pick<UserRecord, 'name' | 'role' | 'active' | 'units' | 'emailOptional' | 'passwordHash'>>, t?: Transaction): Promise<UserRecord | null> {
  const u = await userModel().findByPk(id, { transaction: t })
  if (!u) return null
  await u.update(patch, { transaction: t })
  return toRecord(u)
}

/** The account row locked for a change of its credentials. */
export async function findUserForUpdate(id: string, t: Transaction): Promise<UserRecord | null> {
  const u = await userModel().findByPk(id, { transaction: t, lock: t.LOCK.UPDATE })
  return u ? toRecord(u) : null
}
