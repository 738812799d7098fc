import type { Snippet, SnippetInput, SnippetUpdate } from '../../shared/schemas/snippet'
import { api } from './client'

export interface FilledSnippet extends Snippet {
  /** the body with its placeholders filled from this case */
  filled: string
}

export async function snippetsForCase(caseId: string): Promise<FilledSnippet[]> {
  return (await api.get<{ snippets: FilledSnippet[] }>(`/api/snippets/for-case/${encodeURIComponent(caseId)}`)).snippets
}

/** A new snippet, personal unless `scope: 'team'`; 409 'duplicate' for a title already taken there. */
export function saveSnippet(input: SnippetInput): Promise<Snippet> {
  return api.post('/api/snippets', input)
}
/** Only the author may change a personal snippet; anyone on the desk a team one (audited). 404 otherwise. */
export const updateSnippet = (id: string, input: SnippetUpdate) => api.put<Snippet>(`/api/snippets/${encodeURIComponent(id)}`, input)
export const deleteSnippet = (id: string) => api.delete<void>(`/api/snippets/${encodeURIComponent(id)}`)
