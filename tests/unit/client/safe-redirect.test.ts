import { describe, expect, it } from 'vitest'
import { safeRedirect } from '../../../src/router/routes'

// Open redirect through the sign-in / sign-up `redirect` parameter (OWASP Unvalidated Redirects and
// Forwards cheat sheet). The WHATWG URL parser removes ASCII tab and newline anywhere in the input and,
// for http(s), reads `\` as `/` (URL Standard, "basic URL parser"), so those can turn a path into `//host`.
describe('safeRedirect keeps the sign-in redirect on this site', () => {
  it.each(['/queue', '/cases/3f0c?tab=thread', '/rooms/new#top', '/a/b%2F%2Fc'])('follows %s', (v) => {
    expect(safeRedirect(v)).toBe(v)
  })
  it.each([
    'https://evil.example/', '//evil.example', '/\\evil.example', '/\t/evil.example', '/\n/evil.example', '/\r/evil.example',
    '\t//evil.example', '/\\/evil.example', '/x\\..\\..\\evil', 'javascript:alert(1)', '', 'queue', '/\u0000/evil.example',
  ])('refuses %j', (v) => {
    expect(safeRedirect(v)).toBeNull()
  })
  it('refuses anything but a string', () => {
    expect(safeRedirect(['/queue'])).toBeNull()
    expect(safeRedirect(undefined)).toBeNull()
  })
  it('every value it follows resolves to the same origin', () => {
    for (const v of ['/ok', '/%09/evil.example', '/%5Cevil.example', '/.//evil.example', '/..//evil.example']) {
      const out = safeRedirect(v)
      if (out !== null) expect(new URL(out, 'https://desk.example').origin).toBe('https://desk.example')
    }
  })
})
