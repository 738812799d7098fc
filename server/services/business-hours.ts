import { minutesOfDay, type BusinessHours } from '../../shared/schemas/metrics'

/**
 * Working time between two instants, in the team's time zone and weekly hours.
 *
 * Method: walk the calendar dates the interval touches, as dates in the team's zone. For each date
 * whose weekday has hours, turn its local start and end ("09:00", "17:30") into instants with the
 * zone's UTC offset on that date, and add the overlap of [start, end) with [from, to). Offsets come
 * from Intl.DateTimeFormat (the IANA database the runtime ships), so a day on which clocks change is
 * as long as it really is: a 09:00–17:00 day is 8 h whatever the offset, and a night shift never
 * exists because a day's hours never cross midnight.
 *
 * A local time that does not exist (inside a spring-forward gap) is read with the offset in force
 * before the change, and one that happens twice (fall-back) with the offset in force after it; this
 * is what PostgreSQL does for `timestamp AT TIME ZONE` (PostgreSQL manual, "Date/Time Input
 * Interpretation", from memory), so the SQL function `rw_working_seconds` (migration 0010) gives the
 * same figure for the same input.
 */
export function workingMs(from: Date | number, to: Date | number, hours: BusinessHours): number {
  const a = +from
  const b = +to
  if (!(b > a)) return 0
  let total = 0
  for (const day of localDates(a, b, hours.timeZone)) {
    const span = daySpan(day, hours)
    if (span) total += Math.max(0, Math.min(b, span[1]) - Math.max(a, span[0]))
  }
  return total
}

/** The same interval in hours (calendar hours without business hours). */
export function elapsedHours(from: Date | number, to: Date | number, hours: BusinessHours | null): number {
  return (hours ? workingMs(from, to, hours) : Math.max(0, +to - +from)) / 3_600_000
}

/**
 * The instant at which `ms` of working time have passed since `from` (the due time of a target).
 * Without business hours it is plain addition.
 */
export function addWorkingMs(from: Date | number, ms: number, hours: BusinessHours | null): Date {
  const a = +from
  if (!hours) return new Date(a + ms)
  if (ms <= 0) return new Date(a)
  let left = ms
  let day = localDate(a, hours.timeZone)
  // 400 weeks without a working day cannot happen: the schema asks for at least one working day.
  for (let i = 0; i < 2800; i++, day = nextDate(day)) {
    const span = daySpan(day, hours)
    if (!span) continue
    const start = Math.max(a, span[0])
    const available = span[1] - start
    if (available <= 0) continue
    if (available >= left) return new Date(start + left)
    left -= available
  }
  throw new RangeError('no working hours in the next 400 weeks: check the working week')
}

interface LocalDate { y: number; m: number; d: number }

function daySpan(day: LocalDate, hours: BusinessHours): [number, number] | null {
  const weekday = (new Date(Date.UTC(day.y, day.m - 1, day.d)).getUTCDay() + 6) % 7 // Monday = 0
  const h = hours.week[weekday]
  if (!h) return null
  return [zonedToInstant(day, minutesOfDay(h.start), hours.timeZone), zonedToInstant(day, minutesOfDay(h.end), hours.timeZone)]
}

function* localDates(a: number, b: number, timeZone: string): Generator<LocalDate> {
  const last = localDate(b, timeZone)
  const lastKey = Date.UTC(last.y, last.m - 1, last.d)
  for (let day = localDate(a, timeZone); Date.UTC(day.y, day.m - 1, day.d) <= lastKey; day = nextDate(day)) yield day
}

function nextDate(day: LocalDate): LocalDate {
  const t = new Date(Date.UTC(day.y, day.m - 1, day.d + 1))
  return { y: t.getUTCFullYear(), m: t.getUTCMonth() + 1, d: t.getUTCDate() }
}

const formatters = new Map<string, Intl.DateTimeFormat>()
function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone)
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit',
    })
    formatters.set(timeZone, f)
  }
  return f
}

function wallClock(instant: number, timeZone: string) {
  const parts: Record<string, number> = {}
  for (const p of formatter(timeZone).formatToParts(new Date(instant))) if (p.type !== 'literal') parts[p.type] = Number(p.value)
  return parts as { year: number; month: number; day: number; hour: number; minute: number; second: number }
}

function localDate(instant: number, timeZone: string): LocalDate {
  const w = wallClock(instant, timeZone)
  return { y: w.year, m: w.month, d: w.day }
}

/** The zone's offset from UTC at an instant, in ms (local wall clock minus UTC). */
export function zoneOffsetMs(instant: number, timeZone: string): number {
  const whole = Math.floor(instant / 1000) * 1000
  const w = wallClock(whole, timeZone)
  return Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second) - whole
}

/** The instant of a local wall-clock time (minutes after local midnight) on a local date. */
export function zonedToInstant(day: LocalDate, minutes: number, timeZone: string): number {
  const asUtc = Date.UTC(day.y, day.m - 1, day.d, 0, minutes)
  const before = zoneOffsetMs(asUtc - 18 * 3_600_000, timeZone)
  const after = zoneOffsetMs(asUtc + 18 * 3_600_000, timeZone)
  const fits = (off: number) => zoneOffsetMs(asUtc - off, timeZone) === off
  if (fits(after)) return asUtc - after // also the choice when the time happens twice
  if (fits(before)) return asUtc - before
  return asUtc - before // inside a gap: read with the offset before the change
}
