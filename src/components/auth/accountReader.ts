import type { Router } from 'vue-router'
import type { AccountReader, Reader } from '../../../shared/words/people'

/** A `for=staff` / `for=listener` hint (query or link fragment) as a reader; anything else is unknown. */
export function readerHint(value: unknown): Reader | null {
  return value === 'staff' || value === 'listener' ? value : null
}

/** Who a page behind the redirect is for: staff-only pages mean staff, listener-only pages a listener. */
export function readerOfRedirect(router: Router, redirect: string | null): Reader | null {
  if (!redirect) return null
  const roles = router.resolve(redirect).meta.roles
  if (!roles?.length) return null
  if (!roles.includes('listener')) return 'staff'
  return roles.every((r) => r === 'listener') ? 'listener' : null
}

/** The first reader that is known, else everyone. */
export const accountReader = (...known: (Reader | null)[]): AccountReader => known.find((r) => r !== null) ?? 'everyone'
