import { mdiAlertCircleOutline, mdiAlertOutline, mdiInformationOutline } from '@mdi/js'
import { formatAgo, formatDateTime } from '../../../shared/words/dates'
import { flagLabel, severityLabels, type Severity } from '../../../shared/words/flags'

export { severityOf, type Severity } from '../../../shared/words/flags'

const minute = 60_000
const hour = 60 * minute
const day = 24 * hour

/** "just now", "12 min ago", "3 h ago", "2 days ago", then the date (shared/words/dates.ts). */
export const ago = (iso: string | null | undefined, now = Date.now()): string => formatAgo(iso, now)

/** A span of time without "ago": "40 min", "5 h", "3 days 4 h" (compact: "3 d 4 h"). */
export function span(fromIso: string | null | undefined, now = Date.now(), compact = false): string {
  if (!fromIso) return '–'
  const diff = Math.max(0, now - new Date(fromIso).getTime())
  if (diff < hour) return `${Math.max(1, Math.floor(diff / minute))} min`
  if (diff < day) return `${Math.floor(diff / hour)} h`
  const days = Math.floor(diff / day)
  const hours = Math.floor((diff - days * day) / hour)
  const d = compact ? `${days} d` : `${days} day${days === 1 ? '' : 's'}`
  return `${d}${hours ? ` ${hours} h` : ''}`
}

export function hoursSince(iso: string | null | undefined, now = Date.now()): number {
  return iso ? (now - new Date(iso).getTime()) / hour : 0
}

/** The one date-and-time format, in the viewer's zone (shared/words/dates.ts). */
export const dateTime = (iso: string): string => formatDateTime(iso)

/** Severity shown by icon and word as well as colour. */
export const severityLook: Record<Severity, { icon: string; color: string; label: string }> = {
  problem: { icon: mdiAlertCircleOutline, color: 'error', label: severityLabels.problem },
  warning: { icon: mdiAlertOutline, color: 'warning', label: severityLabels.warning },
  info: { icon: mdiInformationOutline, color: 'info', label: severityLabels.info },
}

/** A flag's name, from the one list in shared/words/flags.ts. */
export const flagName = flagLabel

export const budgetLabels: Record<string, string> = {
  'under-250': 'Under 250',
  '250-1000': '250 to 1,000',
  '1000-3000': '1,000 to 3,000',
  'over-3000': 'Over 3,000',
  'not-sure': 'Not sure yet',
}
