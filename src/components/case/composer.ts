import type { MessageInput } from '../../../shared/schemas/case'
import type { SnippetScope } from '../../../shared/schemas/snippet'
import type { FilledSnippet } from '../../api/snippets'

/** What the message composer (CaseThreadComposer) is given: the same from the listener's page and the workspace. */
export interface ComposerOptions {
  /** advisors and supervisors: internal notes, "ask for information", snippets */
  staff?: boolean
  snippets?: FilledSnippet[]
  snippetsError?: string | null
  /** the triage's setup flags; each message goes into the reply in one click */
  flags?: { id: string; severity: string; message: string }[]
  /** resolves true when the message went out; the draft is then cleared */
  submit: (input: MessageInput) => Promise<boolean>
  disabled?: boolean
  disabledReason?: string
  /** uploads one file to the case and answers it, or null with the reason shown by the caller */
  attach?: (file: File) => Promise<{ id: string; name: string } | null>
  /** staff: keeps the current text as a snippet, their own or the team's */
  saveSnippet?: (input: { title: string; body: string; scope: SnippetScope }) => Promise<boolean>
}
