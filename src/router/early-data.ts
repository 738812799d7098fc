import type { RouteLocationNormalized } from 'vue-router'
import { casePath } from '../api/cases'
import { plansPath } from '../api/plans'

/** The dashboard's figures for the default period (no filter in the address). */
const METRICS = ['status', 'waiting', 'response-times', 'breaches', 'workload', 'reopen-rate', 'flags', 'satisfaction', 'targets'].map((m) => `/api/metrics/${m}`)

/**
 * The GETs a page sends first, by route: the router starts them while the page's code is still loading
 * (fetchEarly in ../api/client.ts), and the page's own requests take the answers. Each URL must be exactly
 * the one the page asks for (tests/unit/client/early-data.test.ts checks it against the API functions);
 * a URL nobody asks for is one wasted request and nothing else. Pages whose first requests depend on
 * their own state (the queue's filters, the room of a case) list only what they ask for regardless.
 */
export function earlyData(to: Pick<RouteLocationNormalized, 'name' | 'params' | 'query'>): string[] {
  const param = (to.params as Record<string, unknown>).id
  const id = typeof param === 'string' ? param : ''
  const c = casePath(id)
  switch (to.name) {
    case 'case-workspace':
      return [c, `${c}/triage`, `${c}/triage/history`, `${c}/messages`, `${c}/files`, `${c}/events`, `/api/snippets/for-case/${encodeURIComponent(id)}`, '/api/auth/preferences']
    case 'case':
      // not the triage: a draft has none (404), and the page asks for it once the case says it was sent
      return [c, `${c}/messages`, `${c}/files`, `${c}/events`, plansPath(id), '/api/auth/preferences']
    case 'plan-editor':
      return [c, plansPath(id)]
    case 'room-edit':
      // an earlier revision (?revision=N) is asked for with its number: only the current one is started here
      return to.query.revision ? ['/api/auth/preferences'] : [`/api/rooms/${encodeURIComponent(id)}`, '/api/auth/preferences']
    case 'dashboard':
      return Object.keys(to.query).length ? [] : [...METRICS, '/api/users']
    case 'queue':
      return ['/api/saved-filters', '/api/auth/preferences']
    default:
      return []
  }
}
