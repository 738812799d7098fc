import { api } from './client'
import { preferencesSchema, type Preferences } from '../../shared/schemas/auth'

export const getPreferences = () => api.get<Preferences>('/api/auth/preferences', { schema: preferencesSchema })
export const setPreferences = (patch: Partial<Preferences>) => api.patch<Preferences>('/api/auth/preferences', patch, { schema: preferencesSchema })

export interface MailboxMessage {
  id: number
  envelopeFrom: string | null
  envelopeTo: string[]
  subject: string
  text: string | null
  html: string | null
  /** header names in lower case */
  headers?: Record<string, string | string[]>
  receivedAt: string
}
export const listMailbox = (query: { to?: string; before?: number } = {}) =>
  api.get<{ messages: MailboxMessage[] }>('/api/dev/mailbox', { query })
