/** One source of words for each thing (flag names, statuses, counts, dates, who a page speaks to). */
export * from './counts'
export * from './dates'
export * from './flags'
export * from './people'
export * from './statuses'
export * from './limits'
export * from './measurements'
