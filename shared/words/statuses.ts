import type { CaseStatus } from '../schemas/case'

/**
 * Our own names for a case's life, the one source every chip, filter, history line, dashboard and
 * e-mail reads: draft → submitted (shown as "New") → in review ⇄ waiting on listener → plan sent → closed.
 */
export const caseStatusLabels: Record<CaseStatus, string> = {
  draft: 'Draft',
  submitted: 'New',
  in_review: 'In review',
  waiting_on_listener: 'Waiting on listener',
  plan_sent: 'Plan sent',
  closed: 'Closed',
}

export const statusLabel = (s: CaseStatus): string => caseStatusLabels[s]
/** The same name inside a sentence: "in review", "waiting on listener", "new". */
export const statusInSentence = (s: CaseStatus): string => caseStatusLabels[s].toLowerCase()

/** Statuses of open work (not a draft, not closed), in lifecycle order. */
export const openStatuses: CaseStatus[] = ['submitted', 'in_review', 'waiting_on_listener', 'plan_sent']

/** What the listener reads beside each status on their own pages (second person). */
export const listenerNextStep: Record<CaseStatus, string> = {
  draft: 'Not sent yet. Finish it and send it to an advisor.',
  submitted: 'Sent. An advisor will pick it up soon.',
  in_review: 'An advisor is working on it.',
  waiting_on_listener: 'An advisor asked you something.',
  plan_sent: 'Your treatment plan is ready.',
  closed: 'Closed. You can reopen it if something comes up.',
}

/** The status-changed e-mail's words, per change; `status` is the case status it leaves the case in. */
export const statusEmailWords = {
  submitted: {
    status: 'submitted',
    headline: 'We have your case',
    explanation: 'an advisor will look at the room and anything you measured, and you will hear from us here and by e-mail.',
  },
  closed: {
    status: 'closed',
    headline: 'Your case is closed',
    explanation: 'we hope the room sounds better. If something is still not right, reply to this e-mail or reopen the case.',
  },
  reopened: {
    status: 'submitted',
    headline: 'Your case is open again',
    explanation: 'an advisor will pick it up where it was left.',
  },
} as const satisfies Record<string, { status: CaseStatus; headline: string; explanation: string }>
