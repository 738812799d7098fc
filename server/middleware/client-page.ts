import type { RequestHandler } from 'express'
import { readFileSync } from 'node:fs'
import { SESSION_ELEMENT_ID, type Session } from '../../shared/schemas/auth'

/**
 * JSON that is safe inside a <script> element: `<`, `>` and `&` cannot end the element or open a comment,
 * U+2028/U+2029 are escaped as well (OWASP XSS Prevention Cheat Sheet, "HTML entity encoding" of JSON
 * in a data block: escape before it reaches the HTML parser). Every escape is still valid JSON.
 */
export function jsonForScript(value: unknown): string {
  return JSON.stringify(value).replace(/[<>&\u2028\u2029]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`)
}

/**
 * The built client's index.html with the answer of GET /api/auth/session written into it, as a JSON data
 * block (not a script: the CSP's script-src is untouched). The first load then needs no round trip to
 * learn who is signed in before the page can be chosen. The answer depends on the session, so it is
 * never stored by the browser or a proxy (`no-store`; an ETag would let a stale user come back).
 */
export function clientPage(indexFile: string): RequestHandler {
  const html = readFileSync(indexFile, 'utf8')
  const at = html.indexOf('</head>')
  if (at < 0) throw new Error(`${indexFile} has no </head>`)
  const head = html.slice(0, at)
  const rest = html.slice(at)
  return (req, res) => {
    const session: Session = { user: req.user ?? null }
    // res.end, not res.send: no ETag either (a revalidated copy could bring an earlier user back)
    res.set('Cache-Control', 'no-store').type('html')
    res.end(`${head}<script id="${SESSION_ELEMENT_ID}" type="application/json">${jsonForScript(session)}</script>${rest}`)
  }
}
