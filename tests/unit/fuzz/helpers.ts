import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { JSDOM } from 'jsdom'
import fc from 'fast-check'

/**
 * How many cases each property runs: a short run in `npm test`, `FUZZ_RUNS=10000` for the nightly mode.
 * `scale` lets a slow property (HTTP round trips, bcrypt) run a fraction of them in the short mode only.
 */
export function fuzzRuns(short = 150): number {
  const n = Number(process.env.FUZZ_RUNS)
  return Number.isFinite(n) && n > 0 ? Math.floor(n) : short
}
export const nightly = () => Number(process.env.FUZZ_RUNS) >= 1000
/** Per-property vitest timeout, ms: generous in the nightly mode. */
export const fuzzTimeout = (shortMs = 60_000) => (nightly() ? 6 * 3600_000 : shortMs)

/** fast-check settings: the run count, and a seed from FUZZ_SEED to replay a failure. */
export const fcParams = (short?: number): fc.Parameters<unknown> => ({
  numRuns: fuzzRuns(short),
  ...(process.env.FUZZ_SEED ? { seed: Number(process.env.FUZZ_SEED) } : {}),
})

/** The XSS payload corpus (tests/fuzz/xss.txt), one payload per line. */
export function xssCorpus(): string[] {
  const text = readFileSync(resolve('tests/fuzz/xss.txt'), 'utf8')
  return text.split('\n').filter((l) => l.trim() && !l.startsWith('# '))
}

const URL_ATTRS = ['href', 'src', 'xlink:href', 'action', 'formaction', 'background', 'poster', 'data', 'srcdoc', 'lowsrc', 'dynsrc', 'cite', 'longdesc', 'usemap', 'codebase']
const DANGEROUS_TAGS = new Set(['script', 'iframe', 'frame', 'frameset', 'object', 'embed', 'applet', 'base', 'link', 'meta', 'style', 'form', 'svg', 'math', 'template', 'noscript'])

/**
 * What makes an HTML fragment unsafe to insert into a page or an e-mail, read the way a browser reads
 * it (jsdom parses it, so entities and odd spacing are decoded first): script-capable elements,
 * event-handler attributes, inline styles, and URL attributes whose scheme is not http(s), mailto,
 * an in-page anchor or a same-site path. Returns the list of problems (empty when safe).
 */
let checker: { dom: JSDOM; uses: number } | undefined
export function unsafeHtml(html: string, opts: { allowStyle?: boolean; allowTags?: string[] } = {}): string[] {
  // one parser window, replaced now and then (jsdom frees parsed documents lazily)
  if (!checker || ++checker.uses > 300) {
    checker?.dom.window.close()
    checker = { dom: new JSDOM('<!doctype html><body></body>'), uses: 0 }
  }
  const parsed = new checker.dom.window.DOMParser().parseFromString(`<!doctype html><html><head></head><body>${html}</body></html>`, 'text/html')
  const problems: string[] = []
  const allowed = new Set(opts.allowTags ?? [])
  for (const el of [...parsed.head.querySelectorAll('*'), ...parsed.body.querySelectorAll('*')]) {
    const tag = el.tagName.toLowerCase()
    // an empty <template> is inert; one with content could be cloned into the page by a script
    if (DANGEROUS_TAGS.has(tag) && !allowed.has(tag) && !(tag === 'template' && !el.innerHTML.trim())) problems.push(`<${tag}>`)
    for (const a of Array.from(el.attributes)) {
      const name = a.name.toLowerCase()
      if (name.startsWith('on')) problems.push(`${tag}[${name}]`)
      if (name === 'style' && !opts.allowStyle) problems.push(`${tag}[style]`)
      if (URL_ATTRS.includes(name)) {
        // browsers strip ASCII whitespace and control characters from URLs before reading the scheme
        const v = a.value.replace(/[\u0000-\u0020\u007f]+/g, '').toLowerCase()
        if (!/^(?:https?:|mailto:|#|\/(?!\/)|[^:]*$)/.test(v) || v.startsWith('//')) problems.push(`${tag}[${name}=${a.value.slice(0, 40)}]`)
      }
    }
  }
  return problems
}
