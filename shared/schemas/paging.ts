import { z } from 'zod'

/** The paging fields of a list's query string: `page` 1…10 000 (default 1), `pageSize` 1…`maxSize` (default `defaultSize`). */
export const pageQuery = (maxSize: number, defaultSize: number) => ({
  page: z.coerce.number().int().min(1).max(10_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(maxSize).default(defaultSize),
})
