import { readFileSync } from 'node:fs'
import { roleLabels } from '../../shared/words/people'
import { fileURLToPath } from 'node:url'
import { JSDOM } from 'jsdom'
import createDOMPurify, { type DOMPurify } from 'dompurify'
import { renderMarkdown } from '../../shared/markdown'
import { z } from 'zod'
import { config } from '../config'
import { formatDateTime } from '../../shared/words/dates'
import { caseStatusLabels, statusEmailWords } from '../../shared/words/statuses'

/**
 * E-mail templates: one HTML and one plain-text file per kind in templates/, wrapped in
 * templates/layout.{html,txt}. The first line of each .txt file is `Subject: …`.
 *
 * Placeholders: `{{name}}` inserts a value (HTML-escaped in .html files), `{{{name}}}` inserts HTML
 * produced on this server (sanitised markdown, our own fragments) unescaped. A placeholder without a
 * value is an error, so a typo in a template cannot send a half-filled e-mail.
 */

export const EMAIL_KINDS = ['reply', 'info-requested', 'status-changed', 'plan-sent', 'invitation', 'welcome', 'password-reset', 'password-changed'] as const
export type EmailKind = (typeof EMAIL_KINDS)[number]

/** Sent even when the user turned optional e-mails off. */
export const ESSENTIAL_KINDS: ReadonlySet<EmailKind> = new Set(['reply', 'info-requested', 'plan-sent', 'invitation', 'password-reset', 'password-changed'])
/** About one case: carry the case title and link, a per-case Reply-To, and the reply hint. */
export const CASE_KINDS: ReadonlySet<EmailKind> = new Set(['reply', 'info-requested', 'status-changed', 'plan-sent'])

/** The line above which a listener writes; the quote stripper cuts there (server/mail/inbound.ts). */
export const REPLY_MARKER = 'Write your answer above this line to add it to the case'

const name = z.string().trim().min(1).max(200)
const httpUrl = z.string().url().refine((u) => /^https?:\/\//i.test(u), 'the link must be http(s)')
const caseFields = {
  recipientName: name,
  caseTitle: z.string().trim().min(1).max(300),
  /** The link is PUBLIC_URL/cases/<caseId>, or `caseUrl` when given. */
  caseId: z.string().min(1).max(100).optional(),
  caseUrl: httpUrl.optional(),
}
const needsLink = (v: { caseId?: string; caseUrl?: string }) => !!(v.caseId || v.caseUrl)
const linkIssue = { message: 'a case e-mail needs caseId or caseUrl', path: ['caseId'] }
const markdown = z.string().max(100_000)

export const emailVarsSchemas = {
  reply: z.object({ ...caseFields, advisorName: name, body: markdown.min(1) }).refine(needsLink, linkIssue),
  'info-requested': z.object({ ...caseFields, advisorName: name, body: markdown.min(1) }).refine(needsLink, linkIssue),
  'status-changed': z
    .object({ ...caseFields, status: z.enum(['submitted', 'received', 'closed', 'reopened']), note: z.string().max(2000).optional() })
    .refine(needsLink, linkIssue),
  'plan-sent': z.object({ ...caseFields, advisorName: name.optional(), summary: markdown.optional() }).refine(needsLink, linkIssue),
  invitation: z.object({
    recipientName: name,
    inviterName: name,
    role: z.enum(['listener', 'advisor', 'supervisor']),
    setPasswordUrl: httpUrl,
    expiresAt: z.coerce.date(),
  }),
  welcome: z.object({ recipientName: name }),
  'password-reset': z.object({ recipientName: name, resetUrl: httpUrl, expiresAt: z.coerce.date() }),
  'password-changed': z.object({ recipientName: name, changedAt: z.coerce.date(), how: z.enum(['signed-in', 'reset-link']) }),
} satisfies Record<EmailKind, z.ZodType>

export type EmailVars<K extends EmailKind> = z.input<(typeof emailVarsSchemas)[K]>

/** Other names accepted for some vars (the case services' names); the canonical name wins when both are given. */
export const VAR_ALIASES: Record<string, string> = { listenerName: 'recipientName', authorName: 'advisorName', bodyMarkdown: 'body', change: 'status' }
export function canonicalVars(vars: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {}
  for (const [k, v] of Object.entries(vars ?? {})) if (VAR_ALIASES[k] && v !== undefined) out[VAR_ALIASES[k]] = v
  for (const [k, v] of Object.entries(vars ?? {})) if (!VAR_ALIASES[k] && v !== undefined) out[k] = v
  return out
}
export interface RenderedEmail { subject: string; html: string; text: string }

/** PUBLIC_URL, or http://localhost:PORT when none is configured; no trailing slash. */
export function publicBaseUrl(): string {
  const c = config()
  return (c.PUBLIC_URL ?? `http://localhost:${c.PORT}`).replace(/\/+$/, '')
}
export const caseUrl = (caseId: string) => `${publicBaseUrl()}/cases/${encodeURIComponent(caseId)}`

// ---------------------------------------------------------------- markdown

let purifier: DOMPurify | undefined
const purify = (): DOMPurify => (purifier ??= createDOMPurify(new JSDOM('').window as unknown as Parameters<typeof createDOMPurify>[0]))

/**
 * The one server-side markdown renderer (messages in the API and in e-mails): shared/markdown.ts with a
 * DOMPurify over a jsdom window — the client's preview runs the same renderer with the browser's DOMPurify.
 * Addresses are resolved against PUBLIC_URL.
 */
export function renderMarkdownSafe(md: string): string {
  return renderMarkdown(md, purify(), publicBaseUrl())
}

// ---------------------------------------------------------------- placeholders

const ESC: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' }
export const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ESC[c])

/** Fills `{{x}}` (escaped in html mode) and `{{{x}}}` (raw) placeholders. */
export function fillTemplate(template: string, values: Record<string, string>, mode: 'html' | 'text', templateName = 'template'): string {
  return template.replace(/\{\{\{\s*([\w]+)\s*\}\}\}|\{\{\s*([\w]+)\s*\}\}/g, (_m, raw: string | undefined, escaped: string | undefined) => {
    const key = (raw ?? escaped)!
    const v = values[key]
    if (v === undefined) throw new Error(`${templateName} uses {{${key}}} but no value was given for it`)
    return raw !== undefined || mode === 'text' ? v : escapeHtml(v)
  })
}

const templatesDir = fileURLToPath(new URL('../../templates/', import.meta.url))
const cache = new Map<string, string>()
function templateFile(file: string): string {
  let t = cache.get(file)
  if (t === undefined) {
    t = readFileSync(templatesDir + file, 'utf8')
    if (process.env.NODE_ENV === 'production') cache.set(file, t)
  }
  return t
}

// ---------------------------------------------------------------- per-kind values

/** E-mails are read away from the screen, in no known zone: times are written in UTC and say so. */
const utcText = (d: Date) => formatDateTime(d, { timeZone: 'UTC', withZone: true })

function kindValues(kind: EmailKind, v: Record<string, unknown>): { values: Record<string, string>; preheader: string } {
  const s = (k: string) => String(v[k] ?? '')
  const base: Record<string, string> = { recipientName: s('recipientName') }
  if (CASE_KINDS.has(kind)) Object.assign(base, { caseTitle: s('caseTitle'), caseUrl: v.caseUrl ? s('caseUrl') : caseUrl(s('caseId')) })
  switch (kind) {
    case 'reply':
    case 'info-requested':
      return {
        values: { ...base, advisorName: s('advisorName'), body: s('body').trim(), bodyHtml: renderMarkdownSafe(s('body')) },
        preheader: excerpt(s('body')),
      }
    case 'status-changed': {
      const { status, ...words } = statusEmailWords[(v.status === 'received' ? 'submitted' : v.status) as keyof typeof statusEmailWords]
      const note = s('note').trim()
      return {
        values: {
          ...base,
          ...words,
          statusLabel: caseStatusLabels[status],
          note,
          noteHtml: note ? `<p style="margin:0 0 16px;padding:8px 12px;background:#f8f4ee;border-radius:4px;">${escapeHtml(note)}</p>` : '',
        },
        preheader: words.headline,
      }
    }
    case 'plan-sent': {
      const summary = s('summary').trim()
      return {
        values: {
          ...base,
          advisorName: s('advisorName') || 'Your advisor',
          statusLabel: caseStatusLabels.plan_sent,
          summary,
          summaryHtml: summary ? `<div style="margin:0 0 20px;padding:4px 16px;border-left:3px solid #0f4c4f;background:#f8f4ee;">${renderMarkdownSafe(summary)}</div>` : '',
        },
        preheader: summary ? excerpt(summary) : 'Your treatment plan is ready',
      }
    }
    case 'invitation': {
      const expires = v.expiresAt as Date
      return {
        values: {
          ...base,
          inviterName: s('inviterName'),
          roleLabel: roleLabels[v.role as keyof typeof roleLabels].toLowerCase(),
          setPasswordUrl: s('setPasswordUrl'),
          expiresText: utcText(expires),
        },
        preheader: 'Choose a password to sign in',
      }
    }
    case 'welcome':
      return { values: { ...base, appUrl: `${publicBaseUrl()}/` }, preheader: 'Describe your room and see its modes at once' }
    case 'password-reset':
      return {
        values: { ...base, resetUrl: s('resetUrl'), expiresText: utcText(v.expiresAt as Date) },
        preheader: 'A link to choose a new password',
      }
    case 'password-changed':
      return {
        values: {
          ...base,
          changedText: utcText(v.changedAt as Date),
          howText: v.how === 'reset-link' ? 'with a link sent to this address' : 'while signed in, with the old password',
          signInUrl: `${publicBaseUrl()}/sign-in`,
        },
        preheader: 'If this was not you, choose a new password now',
      }
  }
}

function excerpt(md: string, max = 120): string {
  const plain = md.replace(/[#>*_`~[\]()!|-]+/g, ' ').replace(/\s+/g, ' ').trim()
  return plain.length > max ? `${plain.slice(0, max - 1)}…` : plain
}

/**
 * Renders one e-mail of `kind` from its vars (validated: a missing or wrong var throws a TypeError
 * naming it). Case kinds need `caseId` and `caseTitle` and link to the case.
 */
export function renderEmail<K extends EmailKind>(kind: K, vars: EmailVars<K>): RenderedEmail {
  const schema = emailVarsSchemas[kind] as z.ZodType
  if (!schema) throw new TypeError(`there is no e-mail template for kind "${kind}"`)
  const parsed = schema.safeParse(canonicalVars(vars as Record<string, unknown>))
  if (!parsed.success) {
    const what = parsed.error.issues.map((i) => `${i.path.join('.') || '(vars)'}: ${i.message}`).join('; ')
    throw new TypeError(`the ${kind} e-mail cannot be rendered: ${what}`)
  }
  const { values, preheader } = kindValues(kind, parsed.data as Record<string, unknown>)

  const txtSource = templateFile(`${kind}.txt`).replace(/\r\n?/g, '\n')
  const m = /^Subject:[ \t]*(.*)\n\n?/.exec(txtSource)
  if (!m) throw new Error(`templates/${kind}.txt must start with a "Subject: …" line`)
  const subject = fillTemplate(m[1], values, 'text', `templates/${kind}.txt`).replace(/[\r\n\t]+/g, ' ').replace(/\s{2,}/g, ' ').trim().slice(0, 300)

  const isCase = CASE_KINDS.has(kind)
  const essential = ESSENTIAL_KINDS.has(kind)
  const footer = essential
    ? 'You receive this because it concerns your Roomwright account or case; it is sent even when optional e-mails are turned off.'
    : 'You can turn off optional e-mails like this one in your Roomwright account settings.'
  const hintText = 'Reply to this e-mail to answer in the case; your answer lands in the case thread.'

  const htmlContent = fillTemplate(templateFile(`${kind}.html`), values, 'html', `templates/${kind}.html`)
  const html = fillTemplate(
    templateFile('layout.html'),
    {
      subject,
      preheader,
      content: htmlContent,
      footer,
      replyMarker: isCase ? `<p style="margin:0 0 12px;font-family:Helvetica,Arial,sans-serif;font-size:11px;color:#9a9186;">— ${escapeHtml(REPLY_MARKER)} —</p>` : '',
      replyHint: isCase ? `<p style="margin:0 0 8px;color:#0f4c4f;"><strong>${escapeHtml(hintText)}</strong></p>` : '',
    },
    'html',
    'templates/layout.html',
  )

  const textContent = fillTemplate(txtSource.slice(m[0].length), values, 'text', `templates/${kind}.txt`).trim()
  const text = fillTemplate(
    templateFile('layout.txt'),
    { content: textContent, footer, replyMarker: isCase ? `— ${REPLY_MARKER} —\n\n` : '', replyHint: isCase ? `${hintText}\n\n` : '' },
    'text',
    'templates/layout.txt',
  )
    .replace(/\n{3,}/g, '\n\n')
    .trimStart()

  return { subject, html, text }
}
