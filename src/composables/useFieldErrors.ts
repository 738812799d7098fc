import { reactive } from 'vue'
import type { ZodError } from 'zod'
import type { ApiRequestError } from '../api/client'

const sentence = (message: string) => message.charAt(0).toUpperCase() + message.slice(1)

/** Per-field messages for a form, filled from the shared zod schemas and from the server's `fields`. */
export function useFieldErrors<Field extends string>(fields: readonly Field[]) {
  const errors = reactive(Object.fromEntries(fields.map((field) => [field, [] as string[]]))) as Record<Field, string[]>
  const known = (path: string): path is Field => (fields as readonly string[]).includes(path)

  function clear(field?: Field): void {
    for (const name of field ? [field] : fields) errors[name] = []
  }

  function fromZod(error: ZodError): void {
    clear()
    for (const issue of error.issues) {
      const path = issue.path.join('.')
      if (known(path) && errors[path].length === 0) errors[path] = [sentence(issue.message)]
    }
  }

  /** Puts the server's field messages on their fields; true when any field was named. */
  function fromApi(error: ApiRequestError): boolean {
    let placed = false
    for (const { path, message } of error.fields) {
      if (known(path)) {
        errors[path] = [sentence(message)]
        placed = true
      }
    }
    return placed
  }

  return { errors, clear, fromZod, fromApi }
}
