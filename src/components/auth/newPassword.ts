import type { Ref } from 'vue'
import type { ZodType } from 'zod'
import { ApiRequestError } from '../../api/client'

/** The two checks of a new password typed twice: the schema's rule, then that both copies agree. */
export function newPasswordErrors(schema: ZodType<string>, password: string, repeat: string): Record<string, string> {
  const errors: Record<string, string> = {}
  const pw = schema.safeParse(password)
  if (!pw.success) errors.password = pw.error.issues[0].message
  if (password !== repeat) errors.repeat = 'the two passwords differ'
  return errors
}

/**
 * Sends a new password through a one-time link (invitation or reset). A 410 (the link was used or has
 * expired) puts the server's words in `gone`, for the page to show instead of the form; field errors go on
 * their fields; anything else is thrown. True once sent.
 */
export async function sendThroughLink(
  send: () => Promise<void>,
  state: { gone: Ref<string | null>; errors: Ref<Record<string, string>> },
): Promise<boolean> {
  try {
    await send()
    return true
  } catch (e) {
    if (e instanceof ApiRequestError && e.status === 410) {
      state.gone.value = e.message
      return false
    }
    if (e instanceof ApiRequestError) state.errors.value = Object.fromEntries(e.fields.map((f) => [f.path, f.message]))
    throw e
  }
}
