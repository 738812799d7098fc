import type { Role } from '../../../shared/schemas/auth'

export type Viewer = { id: string; role: Role }

/** The one rule for internal notes: advisors and supervisors see them, listeners never do (whatever they ask for). */
export const seesInternalNotes = (viewer: Viewer): boolean => viewer.role === 'advisor' || viewer.role === 'supervisor'
