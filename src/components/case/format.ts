import { mdiAlertCircleOutline, mdiAlertOutline, mdiInformationOutline } from '@mdi/js'

const minute = 60_000
const hour = 60 * minute
const day = 24 * hour

/** "just now", "12 min ago", "3 h ago", "2 days ago", then the date. */
export function ago(iso: string | null | undefined, now = Date.now()): string {
  if (!iso) return '–'
  const diff = now - new Date(iso).getTime()
  if (diff < minute) return 'just now'
  if (diff < hour) return `${Math.floor(diff / minute)} min ago`
  if (diff < day) return `${Math.floor(diff / hour)} h ago`
  if (diff < 14 * day) return `${Math.floor(diff / day)} day${diff < 2 * day ? '' : 's'} ago`
  return new Date(iso).toLocaleDateString(undefined, { day: 'numeric', month: 'short', year: 'numeric' })
}

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

export function dateTime(iso: string): string {
  return new Date(iso).toLocaleString(undefined, { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit' })
}

export type Severity = 'info' | 'warning' | 'problem'

/** Severity shown by icon and word as well as colour. */
export const severityLook: Record<Severity, { icon: string; color: string; label: string }> = {
  problem: { icon: mdiAlertCircleOutline, color: 'error', label: 'Problem' },
  warning: { icon: mdiAlertOutline, color: 'warning', label: 'Worth a look' },
  info: { icon: mdiInformationOutline, color: 'info', label: 'Note' },
}

export function severityOf(value: string): Severity {
  return value === 'problem' || value === 'warning' ? value : 'info'
}

/** "facing-long-wall" → "Facing long wall". */
export function flagName(id: string): string {
  const words = id.replace(/-/g, ' ')
  return words.charAt(0).toUpperCase() + words.slice(1)
}

export const budgetLabels: Record<string, string> = {
  'under-250': 'Under 250',
  '250-1000': '250 to 1,000',
  '1000-3000': '1,000 to 3,000',
  'over-3000': 'Over 3,000',
  'not-sure': 'Not sure yet',
}
