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

const placeholderPattern = /\{\{\s*([^{}]*?)\s*\}\}/g

/** The `{{…}}` names in a text that are not placeholders we fill (so the listener would read them as written). */
export function unknownPlaceholders(body: string): string[] {
  const known = new Set(Object.keys(snippetPlaceholders))
  return [...new Set([...body.matchAll(placeholderPattern)].map((m) => m[1]).filter((name) => !known.has(name)))]
}

/** The refusal of a snippet with unknown placeholders, naming them and the ones that exist. */
export function placeholderProblem(body: string): string | null {
  const unknown = unknownPlaceholders(body)
  if (!unknown.length) return null
  const list = unknown.map((u) => `{{${u}}}`).join(', ')
  return `${list} ${unknown.length === 1 ? 'is not a placeholder' : 'are not placeholders'}; use one of ${Object.keys(snippetPlaceholders).map((k) => `{{${k}}}`).join(', ')}`
}

const checkPlaceholders = (v: { body: string }, ctx: z.RefinementCtx) => {
  const problem = placeholderProblem(v.body)
  if (problem) ctx.addIssue({ code: 'custom', path: ['body'], message: problem })
}

const snippetWords = z.object({
  title: z.string().trim().min(1).max(80),
  body: z.string().trim().min(1).max(10_000),
})

/** A change to an existing snippet: its words only (whom it belongs to is fixed when it is made); placeholders must exist. */
export const snippetUpdateSchema = snippetWords.superRefine(checkPlaceholders)
export type SnippetUpdate = z.infer<typeof snippetUpdateSchema>

/** A new snippet; personal unless the author shares it with the team. */
export const snippetSchema = snippetWords.extend({
  scope: z.enum(snippetScopes).default('personal'),
}).superRefine(checkPlaceholders)
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

/** Units a placeholder's value may end with; the same unit written right after it in the text is not repeated. */
const units = ['Hz', 'kHz', 'm', 'ms', 's', 'dB', 'm²', 'm³']

/**
 * Fills `{{name}}` placeholders; unknown ones are left as written so the advisor sees them. A value
 * carries its unit ("27.7 Hz"); when the text already writes that unit after the placeholder
 * ("{{room.firstAxialHz}} Hz"), the unit appears once.
 */
export function fillPlaceholders(body: string, values: Partial<Record<SnippetPlaceholder, string>>): string {
  return body.replace(/\{\{\s*([a-zA-Z.]+)\s*\}\}(\s*(?:Hz|kHz|ms|m²|m³|dB|m|s)(?![\p{L}\p{N}]))?/gu, (all, key: string, after: string | undefined) => {
    const value = values[key as SnippetPlaceholder]
    if (value === undefined) return all
    const unit = units.find((u) => value.endsWith(` ${u}`))
    if (after && unit && after.trim() === unit) return value
    return value + (after ?? '')
  })
}
