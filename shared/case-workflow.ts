import type { CaseStatus } from './schemas/case'
import type { Role } from './schemas/auth'

/**
 * The case lifecycle: who may move a case from which states to which. The server enforces it;
 * the client uses it to offer only the moves that will be accepted.
 */
export interface Transition { to: CaseStatus; from: CaseStatus[]; roles: Role[]; label: string }

export const transitions: Transition[] = [
  { to: 'submitted', from: ['draft'], roles: ['listener'], label: 'Send to an advisor' },
  { to: 'in_review', from: ['submitted', 'waiting_on_listener', 'plan_sent'], roles: ['advisor', 'supervisor'], label: 'Start review' },
  { to: 'waiting_on_listener', from: ['in_review'], roles: ['advisor', 'supervisor'], label: 'Wait for the listener' },
  { to: 'plan_sent', from: ['in_review', 'waiting_on_listener'], roles: ['advisor', 'supervisor'], label: 'Mark plan sent' },
  { to: 'closed', from: ['submitted', 'in_review', 'waiting_on_listener', 'plan_sent'], roles: ['advisor', 'supervisor', 'listener'], label: 'Close the case' },
  // Reopening: a listener's reopened case goes back to the queue; staff take it straight back into review.
  { to: 'submitted', from: ['closed'], roles: ['listener'], label: 'Reopen' },
  { to: 'in_review', from: ['closed'], roles: ['advisor', 'supervisor'], label: 'Reopen' },
]

export function findTransition(from: CaseStatus, to: CaseStatus, role: Role): Transition | undefined {
  return transitions.find((t) => t.to === to && t.from.includes(from) && t.roles.includes(role))
}

export function allowedTransitions(from: CaseStatus, role: Role): Transition[] {
  return transitions.filter((t) => t.from.includes(from) && t.roles.includes(role))
}

/** Statuses in which the team owes the listener something (the clock for "waiting for us" runs). */
export const waitingOnTeam: CaseStatus[] = ['submitted', 'in_review']
