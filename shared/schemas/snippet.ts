import { z } from 'zod'

/** Placeholders a reply snippet may use; the server fills them from the case and its triage. */
export const snippetPlaceholders = {
  'listener.name': "the listener's name",
  'case.title': 'the case title',
  'room.name': 'the room name',
  'room.dimensions': 'length × width × height in metres',
  'room.firstAxialHz': 'the lowest axial mode, Hz',
  'room.schroederHz': 'the Schroeder frequency, Hz',
  'advisor.name': 'your name',
} as const
export type SnippetPlaceholder = keyof typeof snippetPlaceholders

/** `personal`: only its author sees, edits and deletes it. `team`: every advisor may use and edit it; each change is audited. */
export const snippetScopes = ['personal', 'team'] as const
export type SnippetScope = (typeof snippetScopes)[number]

/** A change to an existing snippet: its words only (whom it belongs to is fixed when it is made). */
export const snippetUpdateSchema = z.object({
  title: z.string().trim().min(1).max(80),
  body: z.string().trim().min(1).max(10_000),
})
export type SnippetUpdate = z.infer<typeof snippetUpdateSchema>

/** A new snippet; personal unless the author shares it with the team. */
export const snippetSchema = snippetUpdateSchema.extend({
  scope: z.enum(snippetScopes).default('personal'),
})
export type SnippetInput = z.input<typeof snippetSchema>

export interface Snippet {
  id: string
  title: string
  body: string
  scope: SnippetScope
  /** who wrote it (null when that account is gone) */
  author: { id: string; name: string } | null
  updatedAt: string
}

/** Fills `{{name}}` placeholders; unknown ones are left as written so the advisor sees them. */
export function fillPlaceholders(body: string, values: Partial<Record<SnippetPlaceholder, string>>): string {
  return body.replace(/\{\{\s*([a-zA-Z.]+)\s*\}\}/g, (all, key: string) => values[key as SnippetPlaceholder] ?? all)
}
