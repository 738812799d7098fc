import { describe, expect, it } from 'vitest'
import { mergeStreams } from '../../server/data/queue'

// Fagin's threshold test as used by the queue (Fagin, Lotem & Naor, PODS 2001): the merged first rows
// are returned only when nothing unseen can beat them.
const row = (s: 'a' | 'b' | 'n', id: string, g: boolean, priority: number, key: number) => ({ s, id, g, priority, key })

describe('mergeStreams', () => {
  it('returns the first rows when every stream is exhausted', () => {
    const rows = [row('a', '2', true, 30, 34), row('b', '2', true, 30, 40), row('n', '1', false, 9, 9)]
    expect(mergeStreams(rows, 5, 2)!.map((r) => r.id)).toEqual(['2', '1'])
  })
  it('refuses when an unseen waiting case could still be better than the last row', () => {
    // both waiting streams are full (m = 1): an unseen case may reach min(24 + 8, 31) = 31 > 30
    const rows = [row('a', 'x', true, 30, 32), row('b', 'y', true, 25, 31)]
    expect(mergeStreams(rows, 1, 2)).toBeNull()
  })
  it('accepts when the bound is below the last row, and refuses a tie (an unseen case could have a smaller id)', () => {
    const rows = [row('a', 'x', true, 30, 28), row('b', 'x', true, 30, 40), row('a', 'y', true, 29, 27), row('b', 'y', true, 29, 39)]
    expect(mergeStreams(rows.slice(0, 2), 1, 1)!.map((r) => r.id)).toEqual(['x'])
    const tie = [row('a', 'x', true, 28, 28), row('b', 'x', true, 28, 40)]
    expect(mergeStreams(tie, 1, 1)).toBeNull()
  })
  it('puts cases that need an answer first, whatever the priority', () => {
    const rows = [row('n', 'idle', false, 50, 50), row('a', 'needs', true, 1, 25), row('b', 'needs', true, 1, 1)]
    expect(mergeStreams(rows, 5, 2)!.map((r) => r.id)).toEqual(['needs', 'idle'])
  })
})
