import type { ApiRequestError } from './client'

/** Plain words for an error code; falls back to the server's own message. */
export function userMessage(error: ApiRequestError): string {
  switch (error.code) {
    case 'bad_credentials':
      return "That e-mail address and password don't match an account. Check both and try again."
    case 'email_taken':
      return 'There is already an account with this e-mail address. Sign in instead, or use another address.'
    case 'csrf':
      return 'Your page got out of step with the server. Reload the page and try again.'
  }
  // a per-person limit (server/middleware/user-rate-limit.ts): the server's words say what and how long to wait
  if (error.code === 'too_many_requests') return error.message
  if (error.status === 429) return 'Too many attempts in a short time. Wait a few minutes, then try again.'
  if (error.status === 400 && error.fields.length > 0) return 'Some details need another look: see the marked fields.'
  if (error.status >= 500) return 'Something went wrong on our side. Try again in a moment.'
  return error.message
}
