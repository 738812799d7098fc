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

export const snippetSchema = z.object({
  title: z.string().trim().min(1).max(80),
  body: z.string().trim().min(1).max(10_000),
})
export type SnippetInput = z.infer<typeof snippetSchema>

/** Fills `{{name}}` placeholders; unknown ones are left as written so the advisor sees them. */
export function fillPlaceholders(body: string, values: Partial<Record<SnippetPlaceholder, string>>): string {
  return body.replace(/\{\{\s*([a-zA-Z.]+)\s*\}\}/g, (all, key: string) => values[key as SnippetPlaceholder] ?? all)
}
