import '../mail/setup-config'
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { JSDOM } from 'jsdom'
import createDOMPurify from 'dompurify'
import { MARKDOWN_ALLOWED_ATTR, MARKDOWN_ALLOWED_TAGS, SANITISE_CONFIG, renderMarkdown, resolveAddress, LINK_SCHEMES } from '../../../shared/markdown'
import { renderMarkdownSafe } from '../../../server/mail/templates'
import { unsafeHtml } from '../fuzz/helpers'

/**
 * Issue 13, finding 5: the markdown renderer shared by server and client (shared/markdown.ts) against
 * published XSS / mutation-XSS vectors (tests/fuzz/mxss-published.txt names the source of each: the
 * DOMPurify project's own test corpus, the OWASP XSS Filter Evasion Cheat Sheet, the published DOMPurify
 * namespace-confusion bypasses) and the project's own corpus (tests/fuzz/xss.txt).
 */
const SITE = 'https://desk.roomwright.test'
const window = new JSDOM('').window
const purifier = createDOMPurify(window as unknown as Parameters<typeof createDOMPurify>[0])
const render = (md: string) => renderMarkdown(md, purifier, SITE)

const unescape = (s: string) => s.replace(/\\u([0-9a-fA-F]{4})/g, (_m, h: string) => String.fromCharCode(parseInt(h, 16))).replace(/\\t/g, '\t').replace(/\\n/g, '\n').replace(/\\r/g, '\r')
const corpus = (file: string) =>
  readFileSync(new URL(`../../fuzz/${file}`, import.meta.url), 'utf8').split('\n').filter((l) => l.trim() && !l.startsWith('#')).map(unescape)
const published = corpus('mxss-published.txt')
const own = corpus('xss.txt')

function parse(html: string) {
  return new window.DOMParser().parseFromString(`<!doctype html><body>${html}</body>`, 'text/html').body
}
/** Every element and attribute outside the allow-lists, and any address that is not http(s)/mailto. */
function outsideAllowList(html: string): string[] {
  const tags = new Set<string>(MARKDOWN_ALLOWED_TAGS)
  const attrs = new Set<string>([...MARKDOWN_ALLOWED_ATTR, 'rel', 'target'])
  const found: string[] = []
  for (const el of Array.from(parse(html).querySelectorAll('*'))) {
    const tag = el.tagName.toLowerCase()
    if (!tags.has(tag)) found.push(`<${tag}>`)
    for (const a of Array.from(el.attributes)) {
      if (!attrs.has(a.name)) found.push(`${tag}[${a.name}]`)
      if ((a.name === 'href' || a.name === 'src') && !/^(https?:\/\/|mailto:)/.test(a.value)) found.push(`${tag}[${a.name}=${a.value.slice(0, 30)}]`)
    }
  }
  return found
}

describe('published XSS and mutation-XSS vectors through the shared renderer', () => {
  it('the corpora are there (a test over nothing proves nothing)', () => {
    expect(published.length).toBeGreaterThanOrEqual(40)
    expect(own.length).toBeGreaterThanOrEqual(60)
  })
  for (const [name, list] of [['published', published], ['own', own]] as const) {
    it(`${name} corpus: nothing outside the allow-lists survives, no script-capable markup, no class/id/style`, () => {
      const bad = list.map((v) => ({ v, problems: [...outsideAllowList(render(v)), ...unsafeHtml(render(v))] })).filter((x) => x.problems.length)
      expect(bad).toEqual([])
    })
    it(`${name} corpus: the output is stable when parsed and sanitised again (no mutation on the way to the page)`, () => {
      const unstable = list.filter((v) => {
        const once = render(v)
        return purifier.sanitize(once, { ...SANITISE_CONFIG }) !== once || parse(once).innerHTML !== once
      })
      expect(unstable).toEqual([])
    })
    it(`${name} corpus: the writer's text before and after the vector stays visible`, () => {
      const lost = list.filter((v) => {
        const text = parse(render(`Before-4417 ${v}\n\nAfter-4417: the 52 Hz mode`)).textContent ?? ''
        return !text.includes('Before-4417') || !text.includes('After-4417: the 52 Hz mode')
      })
      expect(lost).toEqual([])
    })
  }
})

describe('markup the old renderer let through (issue 13, finding 5)', () => {
  it('class and id never survive: a message cannot borrow the UI kit\'s utility classes', () => {
    const html = render('<div class="v-overlay position-fixed w-100 h-100" id="app">Pay here</div>')
    expect(parse(html).querySelector('[class], [id], [style]')).toBeNull()
    expect(parse(html).textContent).toContain('Pay here')
  })
  it('raw HTML is shown as the text it is', () => {
    expect(parse(render('Use <b>two</b> panels')).textContent?.trim()).toBe('Use <b>two</b> panels')
  })
  it('content after math/table/style nestings is not dropped', () => {
    for (const v of ['<math><mi>x</mi>', '<table><tr><td>', '<style>', '<svg><style>', '<noscript>', '<textarea>', '<template>', '<!--', '<xmp>', '<title>']) {
      const text = parse(render(`${v}\nMy seat is 1.2 m from the back wall`)).textContent ?? ''
      expect(text, v).toContain('My seat is 1.2 m from the back wall')
    }
  })
  it('links are resolved with the URL parser against the public URL before they count as same-site', () => {
    const href = (md: string) => parse(render(md)).querySelector('a')
    for (const evil of ['/\\evil.example/x', '//evil.example/x', '\\\\evil.example/x', '/\\/evil.example/x', 'https:evil.example/x']) {
      const a = href(`[see](${evil})`)
      if (!a?.hasAttribute('href')) continue
      // what the browser will open: either a path on our own site (marked escaped the backslash) or
      // the other site, then marked as such — never the other site dressed as one of our paths
      const url = new URL(a.getAttribute('href')!)
      if (url.hostname === 'desk.roomwright.test') {
        expect(new URL(a.getAttribute('href')!, SITE).hostname, evil).toBe('desk.roomwright.test')
        expect(url.pathname.startsWith('//') || url.pathname.startsWith('/\\'), evil).toBe(false)
      } else {
        expect(url.hostname, evil).toBe('evil.example')
        expect(a.getAttribute('target'), evil).toBe('_blank')
        expect(a.getAttribute('rel'), evil).toContain('noopener')
      }
    }
    const own = href('[the guide](/guide/measuring)')!
    expect(own.getAttribute('href')).toBe(`${SITE}/guide/measuring`)
    expect(own.hasAttribute('target')).toBe(false)
    expect(href('[mail](mailto:desk@roomwright.test)')!.getAttribute('href')).toBe('mailto:desk@roomwright.test')
  })
  it('tabs and newlines inside a scheme do not hide javascript: (the parser drops them, so do we)', () => {
    for (const v of ['java\tscript:alert(1)', 'java\nscript:alert(1)', ' javascript:alert(1)', 'JaVa\rScRiPt:alert(1)']) {
      expect(resolveAddress(v, SITE, LINK_SCHEMES), JSON.stringify(v)).toBeNull()
      const a = parse(render(`[click](<${v}>)`)).querySelector('a')
      const h = a?.getAttribute('href')
      if (h) expect(new URL(h).protocol, JSON.stringify(v)).toMatch(/^https?:$/)
    }
  })
  it('no data: images (svg or otherwise) and no images from other sites; the alt text stays; our own images load', () => {
    const svg = 'data:image/svg+xml;base64,PHN2ZyB4bWxucz0iaHR0cDovL3d3dy53My5vcmcvMjAwMC9zdmciIG9ubG9hZD0iYWxlcnQoMSkiLz4='
    for (const src of [svg, 'data:image/png;base64,iVBORw0KGgo=', 'https://tracker.example/pixel.png', '//tracker.example/p.png', 'HTTPS://tracker.example/p.png']) {
      const body = parse(render(`![my corner trap](${src})`))
      expect(body.querySelector('img') === null, src).toBe(true)
      expect(body.textContent, src).toContain('my corner trap')
    }
    // a backslash path stays on our site, as the browser reads the escaped address
    for (const img of Array.from(parse(render('![x](/\\tracker.example/p.png)')).querySelectorAll('img'))) expect(new URL(img.getAttribute('src')!).hostname).toBe('desk.roomwright.test')
    const ours = parse(render('![plan](/api/files/6f1c2a8e-2a4b-4c1d-9e3f-0a1b2c3d4e5f/thumbnail)')).querySelector('img')
    expect(ours?.getAttribute('src')).toBe(`${SITE}/api/files/6f1c2a8e-2a4b-4c1d-9e3f-0a1b2c3d4e5f/thumbnail`)
  })
  it('ordinary markdown still renders: emphasis, lists, tables, code, task boxes as text', () => {
    const html = render('**Bass** at *43 Hz*\n\n1. corner trap\n2. side panels\n\n| band | RT60 |\n|:--|--:|\n| 500 Hz | 0.42 s |\n\n`RT60`\n\n- [x] measured')
    expect(outsideAllowList(html)).toEqual([])
    for (const s of ['<strong>Bass</strong>', '<em>43 Hz</em>', '<ol>', '<table>', '<td', '0.42 s', '<code>RT60</code>', '[x] measured']) expect(html).toContain(s)
  })
  it('the server renderer is the shared one (same configuration on both sides)', () => {
    const md = '[a](https://example.test/x) <b>raw</b> ![i](https://example.test/i.png) **b**'
    expect(renderMarkdownSafe(md)).toBe(renderMarkdown(md, createDOMPurify(new JSDOM('').window as unknown as Parameters<typeof createDOMPurify>[0]), 'http://localhost:3000'))
  })
})
