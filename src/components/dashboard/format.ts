import { formatDateTime, formatDayMonth } from '../../../shared/words/dates'

/** Hours as a supervisor reads them: "45 min", "7.5 h", "3.2 days". */
export function hours(h: number | null | undefined): string {
  if (h === null || h === undefined || !Number.isFinite(h)) return '–'
  if (h < 1) return `${Math.max(1, Math.round(h * 60))} min`
  if (h < 48) return `${h < 10 ? h.toFixed(1) : Math.round(h)} h`
  return `${(h / 24).toFixed(1)} days`
}

export const percent = (share: number | null | undefined, digits = 0) =>
  share === null || share === undefined ? '–' : `${(share * 100).toFixed(digits)} %`

/** "3 Mar" for a week starting on that day (in the browser's zone unless one is given). */
export const weekLabel = (iso: string, timeZone?: string) => formatDayMonth(iso, { timeZone })

/** The one date-and-time format (shared/words/dates.ts). */
export const dateTime = (iso: string, timeZone?: string) => formatDateTime(iso, { timeZone })
