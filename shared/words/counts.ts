import { severityOf } from './flags'

/** "1 measurement", "3 measurements" (regular plurals only; pass `plural` for the others). */
export function countOf(n: number, singular: string, plural = `${singular}s`): string {
  return `${n} ${n === 1 ? singular : plural}`
}

/**
 * The one count of a room's checks that need fixing (problems and things worth a look; notes do not
 * count): the triage tab, the analysis summary and the composer's check picker all show this number.
 */
export function checksToFix(flags: readonly { severity: string }[]): number {
  return flags.filter((f) => severityOf(f.severity) !== 'info').length
}

/** "Checks (5)": the label of every place that shows the checks with their count. */
export const checksLabel = (flags: readonly { severity: string }[]): string => `Checks (${checksToFix(flags)})`

/** Where all the checks are listed under that count: "5 to fix, 2 notes" (so a longer list reads right). */
export function checksBreakdown(flags: readonly { severity: string }[]): string {
  const fix = checksToFix(flags)
  const notes = flags.length - fix
  return notes ? `${fix} to fix, ${countOf(notes, 'note')}` : `${fix} to fix`
}

/**
 * The hint where before-and-after measurements are compared with the plan: what to do next, given how
 * many measurements the case has and how many are analysed. Read by the listener, so second person.
 */
export function beforeAfterHint(uploaded: number, analysed: number): string {
  if (uploaded === 0) return 'Add a measurement from before the changes and one from after to this case: they are compared here with what the plan predicted.'
  if (analysed === 0) return `${countOf(uploaded, 'measurement')} added; they are compared here with the plan once analysed.`
  if (analysed === 1) return 'One measurement analysed so far. After the changes, measure again from the same seat and add it to this case: the two are compared here with what the plan predicted.'
  return `${countOf(analysed, 'measurement')} analysed: choose a before and an after to compare.`
}
