import { findUserByEmail, insertUser } from '../../data/users'
import { hashPassword } from '../../services/auth'
import { DEMO_PASSWORD, demoPeople } from '../people'

export async function seed(): Promise<void> {
  const hash = await hashPassword(DEMO_PASSWORD)
  for (const p of demoPeople) {
    if (!(await findUserByEmail(p.email))) await insertUser({ email: p.email, name: p.name, role: p.role, passwordHash: hash })
  }
}
