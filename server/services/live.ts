import { sockets } from '../sockets'

/**
 * Live notifications. Socket rooms: `case:<id>` (everyone who may read the case), `case:<id>:staff`
 * (advisors and supervisors only: internal notes go nowhere else) and `queue` (staff). With the
 * PostgreSQL adapter an emit on one node reaches sockets on every node.
 */
export type LiveEvent =
  | { type: 'case.event'; caseId: string; seq: number; kind: string; internal?: boolean }
  | { type: 'case.message'; caseId: string; messageId: string; internal: boolean }
  | { type: 'case.updated'; caseId: string }
  | { type: 'case.analysis'; caseId: string; fileId: string; status: string }
  | { type: 'queue.changed'; caseId: string }

export function publishCase(caseId: string, event: LiveEvent, opts: { internal?: boolean } = {}): void {
  const io = sockets()
  if (!io) return
  io.to(opts.internal ? `case:${caseId}:staff` : `case:${caseId}`).emit(event.type, event)
}

export function publishQueue(caseId: string): void {
  sockets()?.to('queue').emit('queue.changed', { type: 'queue.changed', caseId })
}
