import type { Role } from '../../shared/schemas/auth'
import people from './data/people.json'

/** The invented demo team and listeners (data/people.json). Password for all: DEMO_PASSWORD (demo database only). */
export const DEMO_PASSWORD = 'roomwright-demo'

export const demoPeople = people as readonly { email: string; name: string; role: Role }[]
