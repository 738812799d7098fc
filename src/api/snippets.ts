import type { SnippetInput } from '../../shared/schemas/snippet'
import { api } from './client'

export interface FilledSnippet {
  id: string
  title: string
  body: string
  /** the body with its placeholders filled from this case */
  filled: string
}

export async function snippetsForCase(caseId: string): Promise<FilledSnippet[]> {
  return (await api.get<{ snippets: FilledSnippet[] }>(`/api/snippets/for-case/${encodeURIComponent(caseId)}`)).snippets
}

export function saveSnippet(input: SnippetInput): Promise<{ id: string; title: string; body: string }> {
  return api.post('/api/snippets', input)
}
