/**
 * The one password-strength check (sign-up, setting a password from an invitation, staff accounts, and
 * any later password change or reset): zxcvbn-ts, the TypeScript port of Dropbox's zxcvbn estimator
 * (Wheeler, "zxcvbn: Low-Budget Password Strength Estimation", USENIX Security 2016), with its common and
 * English dictionaries. The length rule (12–200 characters) stays in the shared passwordSchema.
 */
import { zxcvbn, zxcvbnOptions } from '@zxcvbn-ts/core'
import * as common from '@zxcvbn-ts/language-common'
import * as en from '@zxcvbn-ts/language-en'
import { badRequest } from '../errors'

zxcvbnOptions.setOptions({
  translations: en.translations,
  graphs: common.adjacencyGraphs,
  dictionary: { ...common.dictionary, ...en.dictionary, roomwright: ['roomwright', 'room', 'listening', 'acoustics'] },
})

/**
 * zxcvbn score 0–4; 3 is "safely unguessable: moderate protection from an offline slow-hash attack"
 * (about 10⁸ guesses or more, zxcvbn's own scale).
 */
export const MIN_PASSWORD_SCORE = 3

/**
 * Why a password is too easy to guess, or null when it is fine. `related`: the person's e-mail and name,
 * which a password should not be built from.
 */
export function passwordWeakness(password: string, related: string[] = []): string | null {
  const words = related.flatMap((r) => r.toLowerCase().split(/[^\p{L}\p{N}]+/u)).filter((w) => w.length >= 3)
  const result = zxcvbn(password.slice(0, 100), words)
  if (result.score >= MIN_PASSWORD_SCORE) return null
  const hint = result.feedback.warning || result.feedback.suggestions[0] || 'It is one of the commonly used passwords.'
  return `this password is too easy to guess: ${hint.replace(/\.$/, '')}. Use a few unrelated words or a password manager`
}

/** 400 naming the `password` field when the password is too easy to guess. */
export function assertStrongPassword(password: string, related: string[] = [], path = 'password'): void {
  const weakness = passwordWeakness(password, related)
  if (weakness) throw badRequest('Choose a stronger password', [{ path, message: weakness }])
}
