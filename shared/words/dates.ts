/**
 * The one way Roomwright writes a date or a time: "3 Dec 2026" and "3 Dec 2026, 14:05", always in
 * the viewer's time zone. In the browser that is the browser's own zone (no `timeZone` given); the
 * server passes the zone it writes for (e-mails use UTC and say so, see `withZone`).
 */
export interface DateWordsOptions {
  /** IANA zone name; leave it out for the runtime's own zone (the browser's, in the client) */
  timeZone?: string
  /** add the zone's short name ("UTC", "GMT+1"): for text read away from the screen (e-mails) */
  withZone?: boolean
}

type When = string | number | Date

const LOCALE = 'en-GB'
const cache = new Map<string, Intl.DateTimeFormat>()
function formatter(kind: 'date' | 'dateTime' | 'dayMonth', o: DateWordsOptions): Intl.DateTimeFormat {
  const key = `${kind}|${o.timeZone ?? ''}|${o.withZone ? 1 : 0}`
  let f = cache.get(key)
  if (!f) {
    const base: Intl.DateTimeFormatOptions =
      kind === 'dayMonth' ? { day: 'numeric', month: 'short' } : { day: 'numeric', month: 'short', year: 'numeric' }
    f = new Intl.DateTimeFormat(LOCALE, {
      ...base,
      ...(kind === 'dateTime' ? { hour: '2-digit', minute: '2-digit', hourCycle: 'h23' as const } : {}),
      ...(o.withZone ? { timeZoneName: 'short' as const } : {}),
      ...(o.timeZone ? { timeZone: o.timeZone } : {}),
    })
    cache.set(key, f)
  }
  return f
}

const toDate = (when: When) => (when instanceof Date ? when : new Date(when))
const valid = (when: When | null | undefined): when is When => when !== null && when !== undefined && when !== '' && !Number.isNaN(toDate(when).getTime())

/** "3 Dec 2026" ("–" for no date). */
export function formatDate(when: When | null | undefined, o: DateWordsOptions = {}): string {
  return valid(when) ? formatter('date', o).format(toDate(when)) : '–'
}

/** "3 Dec 2026, 14:05" ("–" for no date). */
export function formatDateTime(when: When | null | undefined, o: DateWordsOptions = {}): string {
  return valid(when) ? formatter('dateTime', o).format(toDate(when)) : '–'
}

/** "3 Dec": the short label of a chart's week axis. */
export function formatDayMonth(when: When | null | undefined, o: DateWordsOptions = {}): string {
  return valid(when) ? formatter('dayMonth', o).format(toDate(when)) : '–'
}

const minute = 60_000
const hour = 60 * minute
const day = 24 * hour

/** "just now", "12 min ago", "3 h ago", "2 days ago", then the date as `formatDate` writes it. */
export function formatAgo(when: When | null | undefined, now = Date.now(), o: DateWordsOptions = {}): string {
  if (!valid(when)) return '–'
  const diff = now - toDate(when).getTime()
  if (diff < minute) return 'just now'
  if (diff < hour) return `${Math.floor(diff / minute)} min ago`
  if (diff < day) return `${Math.floor(diff / hour)} h ago`
  if (diff < 14 * day) return `${Math.floor(diff / day)} day${diff < 2 * day ? '' : 's'} ago`
  return formatDate(when, o)
}

/** The runtime's own zone name ("Europe/Berlin"), as a page may state it beside its dates. */
export const viewerTimeZone = (): string => Intl.DateTimeFormat().resolvedOptions().timeZone
