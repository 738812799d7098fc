import {
  SESSION_ELEMENT_ID, passwordResetRequestedSchema, sessionSchema, userSchema, type ChangePasswordInput, type LoginInput, type PasswordResetInput, type RegisterInput, type Session, type User,
} from '../../shared/schemas/auth'
import { ApiRequestError, api, forgetCsrfToken } from './client'

/**
 * The answer of GET /api/auth/session that the server wrote into the page it served (server/middleware/
 * client-page.ts), taken once: a later check asks the server again. Null when the page has none (the vite
 * dev server) or it does not read as a session.
 */
function sessionInPage(): Session | null {
  const el = typeof document === 'undefined' ? null : document.getElementById(SESSION_ELEMENT_ID)
  if (!el) return null
  el.remove()
  try {
    const parsed = sessionSchema.safeParse(JSON.parse(el.textContent ?? ''))
    return parsed.success ? parsed.data : null
  } catch {
    return null
  }
}

/** The signed-in user, or null when there is no session (GET /api/auth/session answers 200 either way). */
export async function getMe(): Promise<User | null> {
  const inPage = sessionInPage()
  if (inPage) return inPage.user
  return (await api.get('/api/auth/session', { schema: sessionSchema, notifyUnauthorized: false })).user
}

/** 401 'bad_credentials' for a wrong e-mail or password, 429 when rate-limited. */
export async function login(input: LoginInput): Promise<User> {
  const user = await api.post('/api/auth/login', input, { schema: userSchema, notifyUnauthorized: false })
  forgetCsrfToken()
  return user
}

/** Creates a listener account and signs it in; 409 'email_taken', 400 with field paths. */
export async function register(input: RegisterInput): Promise<User> {
  const user = await api.post('/api/auth/register', input, { schema: userSchema })
  forgetCsrfToken()
  return user
}

/** Ends the session; a session that had already lapsed (401) counts as signed out. */
export async function logout(): Promise<void> {
  try {
    await api.post<void>('/api/auth/logout', undefined, { notifyUnauthorized: false })
  } catch (error) {
    if (!(error instanceof ApiRequestError && error.status === 401)) throw error
  }
  forgetCsrfToken()
}

/** 400 'bad_current_password' (field currentPassword) when the current password is wrong; the other sessions end. */
export const changePassword = (input: ChangePasswordInput) => api.post<{ sessionsEnded: number }>('/api/auth/password', input)

/** Always the same answer, whether or not the address has an account; 429 when asked too often. */
export async function requestPasswordReset(email: string): Promise<string> {
  return (await api.post('/api/auth/password-reset/request', { email }, { schema: passwordResetRequestedSchema, notifyUnauthorized: false })).message
}

/** Uses the e-mailed link once; 410 'link_gone' for a used, replaced or expired one. Every session of the account ends. */
export const resetPassword = (input: PasswordResetInput) => api.post<void>('/api/auth/password-reset', input, { notifyUnauthorized: false })
