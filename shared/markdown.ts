import { Marked, type Tokens } from 'marked'
import type { Config, DOMPurify } from 'dompurify'

/**
 * The one markdown renderer of Roomwright, used by the server (thread HTML in the API and in e-mails,
 * with a jsdom DOMPurify) and by the client (the composer's preview, with the browser's DOMPurify):
 * the same marked options, the same allow-lists and the same link rule on both sides.
 *
 * 1. Markdown syntax is the only markup. Raw HTML a writer types (`<b>`, `<style>`, `<math>`…) is shown
 *    as the text it is, never parsed: nothing after an odd nesting can vanish, and the listener's words
 *    stay visible when their markup is refused.
 * 2. DOMPurify then keeps only the tags and attributes below (no class, id, style, data-* or aria-*:
 *    a message cannot borrow the page's utility classes to overlay it).
 * 3. Every link and image address is resolved with the WHATWG URL parser against the public URL before
 *    anything is decided, exactly as a browser will read it (`/\evil.example` and `//evil.example` are
 *    other sites; tabs and newlines inside a scheme are dropped by the parser, so `java\tscript:` is
 *    `javascript:`). Links may go to http(s) or mailto; a link to another site opens in a new tab with
 *    rel="noopener noreferrer nofollow". Images only from our own site (no data:, no other hosts, which
 *    would tell a stranger when the listener reads); a refused image leaves its alt text.
 */
export const MARKDOWN_ALLOWED_TAGS = [
  'p', 'br', 'hr', 'strong', 'em', 'del', 's', 'code', 'pre', 'blockquote', 'ul', 'ol', 'li',
  'h1', 'h2', 'h3', 'h4', 'h5', 'h6', 'table', 'thead', 'tbody', 'tr', 'th', 'td', 'a', 'img',
] as const
/** `rel` and `target` are not taken from the writer: the link rule sets them. */
export const MARKDOWN_ALLOWED_ATTR = ['href', 'title', 'src', 'alt', 'align', 'start'] as const
export const LINK_SCHEMES: ReadonlySet<string> = new Set(['http:', 'https:', 'mailto:'])
export const IMAGE_SCHEMES: ReadonlySet<string> = new Set(['http:', 'https:'])

export const SANITISE_CONFIG = {
  ALLOWED_TAGS: [...MARKDOWN_ALLOWED_TAGS],
  ALLOWED_ATTR: [...MARKDOWN_ALLOWED_ATTR],
  ALLOW_DATA_ATTR: false,
  ALLOW_ARIA_ATTR: false,
  ALLOW_UNKNOWN_PROTOCOLS: false,
  ALLOW_SELF_CLOSE_IN_ATTR: false,
  SAFE_FOR_TEMPLATES: false,
  KEEP_CONTENT: true,
  // schemes only; the hook below resolves every address and decides on the parsed URL
  ALLOWED_URI_REGEXP: /^(?:(?:https?|mailto):|[^a-z]|[a-z+.-]+(?:[^a-z+.\-:]|$))/i,
} satisfies Config

export type LinkDecision = { href: string; sameSite: boolean } | null

/** A link or image address as the browser will read it, relative to `base`; null when it is refused. */
export function resolveAddress(raw: string, base: string, schemes: ReadonlySet<string>): LinkDecision {
  let url: URL
  let origin: string
  try {
    url = new URL(raw, base)
    origin = new URL(base).origin
  } catch {
    return null
  }
  if (!schemes.has(url.protocol)) return null
  if ((url.protocol === 'http:' || url.protocol === 'https:') && !url.hostname) return null
  return { href: url.href, sameSite: url.origin === origin }
}

const ESC: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' }
const escapeText = (s: string) => s.replace(/[&<>"']/g, (c) => ESC[c])

const marked = new Marked({
  gfm: true,
  breaks: true,
  async: false,
  renderer: {
    // raw HTML is text (see 1. above); a block keeps its line breaks
    html(token: Tokens.HTML | Tokens.Tag) {
      const text = escapeText(token.text)
      return 'block' in token && token.block ? `<p>${text.trimEnd().replace(/\n/g, '<br>')}</p>\n` : text
    },
    // task-list boxes as text, not form controls
    checkbox({ checked }: Tokens.Checkbox) {
      return checked ? '[x] ' : '[ ] '
    },
  },
})

const prepared = new WeakMap<DOMPurify, { base: string }>()

function prepare(purifier: DOMPurify): { base: string } {
  let state = prepared.get(purifier)
  if (state) return state
  const s = { base: 'http://localhost/' }
  purifier.addHook('afterSanitizeAttributes', (node) => {
    const el = node as Element
    if (el.tagName === 'A') {
      el.removeAttribute('target')
      el.removeAttribute('rel')
      const raw = el.getAttribute('href')
      if (raw === null) return
      const link = resolveAddress(raw, s.base, LINK_SCHEMES)
      if (!link) return el.removeAttribute('href') // the words stay, without the link
      el.setAttribute('href', link.href)
      if (!link.sameSite) {
        el.setAttribute('rel', 'noopener noreferrer nofollow')
        el.setAttribute('target', '_blank')
      }
    } else if (el.tagName === 'IMG') {
      const raw = el.getAttribute('src')
      const image = raw === null ? null : resolveAddress(raw, s.base, IMAGE_SCHEMES)
      if (image?.sameSite) return el.setAttribute('src', image.href)
      // an image from elsewhere (or data:) is not loaded: its description stays as text
      const alt = el.getAttribute('alt')?.trim()
      el.replaceWith(el.ownerDocument.createTextNode(alt ? `[image: ${alt}]` : '[image]'))
    }
  })
  prepared.set(purifier, s)
  state = s
  return state
}

/**
 * Markdown to safe HTML. `purifier` is a DOMPurify instance (the browser's, or one over a jsdom window
 * on the server); `publicUrl` is the site's public URL, against which addresses are resolved.
 */
export function renderMarkdown(md: string, purifier: DOMPurify, publicUrl: string): string {
  const state = prepare(purifier)
  state.base = publicUrl.endsWith('/') ? publicUrl : `${publicUrl}/`
  const raw = marked.parse(md ?? '') as string
  return purifier.sanitize(raw, { ...SANITISE_CONFIG, RETURN_TRUSTED_TYPE: false }) as unknown as string
}
