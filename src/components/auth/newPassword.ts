import type { ZodType } from 'zod'

/** The two checks of a new password typed twice: the schema's rule, then that both copies agree. */
export function newPasswordErrors(schema: ZodType<string>, password: string, repeat: string): Record<string, string> {
  const errors: Record<string, string> = {}
  const pw = schema.safeParse(password)
  if (!pw.success) errors.password = pw.error.issues[0].message
  if (password !== repeat) errors.repeat = 'the two passwords differ'
  return errors
}
