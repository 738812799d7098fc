import { afterEach, describe, expect, it, vi } from 'vitest'
import { earlyData } from '../../../src/router/early-data'
import { fetchEarly, forgetEarly, api } from '../../../src/api/client'
import * as cases from '../../../src/api/cases'
import * as files from '../../../src/api/files'
import * as plans from '../../../src/api/plans'
import * as metrics from '../../../src/api/metrics'
import { snippetsForCase } from '../../../src/api/snippets'
import { getPreferences } from '../../../src/api/account'
import { getRoom } from '../../../src/api/rooms'

const ID = 'c0ffee00-0000-4000-8000-00000000e4a1'

/** A fetch that answers `{}` and counts what it was asked for. */
function countingFetch() {
  const asked: string[] = []
  vi.stubGlobal('fetch', vi.fn(async (url: string) => {
    asked.push(url)
    return new Response('{}', { status: 200, headers: { 'Content-Type': 'application/json' } })
  }))
  return asked
}

afterEach(() => {
  forgetEarly()
  vi.unstubAllGlobals()
})

/** Each early URL is asked for once: the page's own request for it took the early answer instead of asking again. */
async function expectTaken(route: Parameters<typeof earlyData>[0], pageRequests: () => Promise<unknown>[]) {
  const asked = countingFetch()
  const early = earlyData(route)
  fetchEarly(early)
  expect(asked).toEqual(early)
  await Promise.allSettled(pageRequests())
  // nothing asked twice, and nothing the page asks for first is missing from the early list
  expect(asked.slice(early.length)).toEqual([])
}

describe('early data: the URLs the router starts are the ones the pages ask for', () => {
  it('the advisor workspace: case, triage, history, thread, files, events, snippets, units', async () => {
    await expectTaken({ name: 'case-workspace', params: { id: ID }, query: {} }, () => [
      cases.getCase(ID), cases.getTriage(ID), cases.getTriageHistory(ID), cases.listMessages(ID), files.listFiles(ID), cases.listEvents(ID), snippetsForCase(ID), getPreferences(),
    ])
  })
  it("the listener's case page: case, thread, files, events, plans, units (the triage only once the case says it was sent)", async () => {
    await expectTaken({ name: 'case', params: { id: ID }, query: {} }, () => [
      cases.getCase(ID), cases.listMessages(ID), files.listFiles(ID), cases.listEvents(ID), plans.listPlans(ID), getPreferences(),
    ])
  })
  it('the plan editor, the room editor and the queue', async () => {
    await expectTaken({ name: 'plan-editor', params: { id: ID }, query: {} }, () => [cases.getCase(ID), plans.listPlans(ID)])
    await expectTaken({ name: 'room-edit', params: { id: ID }, query: {} }, () => [getRoom(ID), getPreferences()])
    await expectTaken({ name: 'queue', params: {}, query: {} }, () => [cases.listSavedFilters(), getPreferences()])
  })
  it('the dashboard without a filter in the address: every figure and the staff list', async () => {
    await expectTaken({ name: 'dashboard', params: {}, query: {} }, () => [
      metrics.getStatusCounts(), metrics.getWaiting(), metrics.getResponseTimes(), metrics.getBreaches(), metrics.getWorkload(),
      metrics.getReopenRate(), metrics.getFlags(), metrics.getSatisfaction(), metrics.getTargets(), cases.listStaff(),
    ])
  })
  it('an early answer is taken once; a change made meanwhile drops the rest', async () => {
    const asked = countingFetch()
    fetchEarly(['/api/cases/x', '/api/cases/y'])
    await api.get('/api/cases/x')
    await api.get('/api/cases/x')
    expect(asked).toEqual(['/api/cases/x', '/api/cases/y', '/api/cases/x'])
    await api.post('/api/cases/x/messages', { body: 'hello' }).catch(() => {})
    await api.get('/api/cases/y')
    expect(asked.filter((u) => u === '/api/cases/y')).toHaveLength(2)
  })
})
