import { describe, expect, it } from 'vitest'
import { fillPlaceholders, placeholderProblem, snippetSchema, unknownPlaceholders } from '../../../shared/schemas/snippet'
import { demoSnippets } from '../../../server/seed/snippets'

const values = { 'listener.name': 'Yara Feldhaus', 'room.firstAxialHz': '27.7 Hz', 'room.schroederHz': '212 Hz', 'room.dimensions': '6.2 × 4.1 × 2.5 m' }

describe('snippet placeholders', () => {
  it('a value keeps its unit once, whether or not the text writes the unit after it', () => {
    expect(fillPlaceholders('The first mode is {{room.firstAxialHz}} Hz.', values)).toBe('The first mode is 27.7 Hz.')
    expect(fillPlaceholders('The first mode is {{room.firstAxialHz}}.', values)).toBe('The first mode is 27.7 Hz.')
    expect(fillPlaceholders('{{room.dimensions}} m, {{room.schroederHz}}Hz', values)).toBe('6.2 × 4.1 × 2.5 m, 212 Hz')
  })
  it('a different word after the value is kept ("Hz" is not eaten from "Hzz" or a following sentence)', () => {
    expect(fillPlaceholders('{{room.firstAxialHz}} Hzz', values)).toBe('27.7 Hz Hzz')
    expect(fillPlaceholders('{{listener.name}} s', values)).toBe('Yara Feldhaus s')
  })
  it('saving refuses unknown placeholders and names the valid ones', () => {
    expect(unknownPlaceholders('Hi {{listener.first}} in {{ room.name }}')).toEqual(['listener.first'])
    expect(placeholderProblem('Hi {{listener.first}}')).toMatch(/\{\{listener\.first\}\} is not a placeholder; use one of .*\{\{listener\.name\}\}/)
    const r = snippetSchema.safeParse({ title: 'Hello', body: 'Hi {{listener.first}}' })
    expect(r.success).toBe(false)
    expect(r.error?.issues[0].path).toEqual(['body'])
    expect(snippetSchema.safeParse({ title: 'Hello', body: 'Hi {{listener.name}}' }).success).toBe(true)
  })
  it('every demo snippet is valid and fills completely', () => {
    const all = { ...values, 'case.title': 'Boom', 'room.name': 'Box room', 'advisor.name': 'Teodor' }
    for (const s of demoSnippets) {
      expect(snippetSchema.safeParse({ ...s, scope: 'team' }).success).toBe(true)
      expect(fillPlaceholders(s.body, all)).not.toMatch(/\{\{|Hz Hz/)
    }
  })
})
