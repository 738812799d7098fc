/**
 * Time to interactive of the largest pages, in headless Chromium against the built client and the demo seed.
 *
 * One figure a page: the median over PAGES_RUNS cold loads (a new browser context each time, so no HTTP
 * cache and no warm module graph), signed in already (the session cookie is in the context). A load is
 * "usable" at the latest of: the page's own ready element visible, the end of the last long task
 * (Long Tasks API, > 50 ms on the main thread) and the end of the last HTTP answer — measured once the
 * page has had QUIET_MS with no request in flight and no long task. The socket.io connection is not a
 * request the page waits on and is left out. Times are from navigation start (performance.timeOrigin).
 *
 * The quiet window is ours (Lighthouse's TTI waits 5 s; we stop at QUIET_MS, then take the last busy
 * moment, so the figure does not include the wait): common practice, no source.
 */
import { execFileSync } from 'node:child_process'
import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import { QueryTypes } from 'sequelize'
import type { Browser, BrowserContext } from 'playwright-core'
import type { Figure } from './index'
import { benchDatabase, percentile } from './lib/db'

const RUNS = Number(process.env.PAGES_RUNS ?? 5)
const QUIET_MS = Number(process.env.PAGES_QUIET_MS ?? 500)
const TARGET = '< 1000 ms'

interface PageCase { name: string; who: string; path: string; ready: string[] }

/** Runs in the page before its own scripts: records long tasks and the answers that came in. */
function observe(): void {
  const w = window as unknown as { __tti: { longTaskEnd: number } }
  w.__tti = { longTaskEnd: 0 }
  try {
    new PerformanceObserver((list) => {
      for (const e of list.getEntries()) w.__tti.longTaskEnd = Math.max(w.__tti.longTaskEnd, e.startTime + e.duration)
    }).observe({ type: 'longtask', buffered: true })
  } catch {
    /* no Long Tasks API: the figure is then ready + answers only */
  }
}

async function ids(): Promise<Record<string, string>> {
  const { db } = await import('../server/db/sequelize')
  const one = async (sql: string): Promise<string> => {
    const rows = await db().query<{ id: string }>(sql, { type: QueryTypes.SELECT })
    if (!rows[0]) throw new Error(`the demo seed has no row for: ${sql}`)
    return rows[0].id
  }
  // The listener's case with a sent plan and analysed measurements: the fullest case page there is.
  const withPlan = `
    SELECT c.id FROM cases c JOIN users u ON u.id = c.listener_id
     WHERE u.email = 'listener@roomwright.test'
       AND EXISTS (SELECT 1 FROM treatment_plans p WHERE p.case_id = c.id AND p.sent_at IS NOT NULL)
     ORDER BY (SELECT count(*) FROM files f WHERE f.case_id = c.id AND f.analysis_status = 'done') DESC, c.created_at LIMIT 1`
  const caseId = await one(withPlan)
  const roomId = await one(`SELECT r.id FROM rooms r JOIN users u ON u.id = r.owner_id WHERE u.email = 'listener@roomwright.test' ORDER BY r.created_at LIMIT 1`)
  return { caseId, roomId }
}

async function waitForAnalyses(): Promise<void> {
  const { db } = await import('../server/db/sequelize')
  const until = Date.now() + 300_000
  for (;;) {
    const [r] = await db().query<{ n: number }>(`SELECT count(*)::int AS n FROM files WHERE kind = 'measurement' AND analysis_status IS DISTINCT FROM 'done' AND analysis_status IS DISTINCT FROM 'failed'`, { type: QueryTypes.SELECT })
    if (r.n === 0 || Date.now() > until) return
    await new Promise((res) => setTimeout(res, 1000))
  }
}

/** One cold load: milliseconds from navigation start to usable, and what made it so. */
async function measureOnce(browser: Browser, state: Awaited<ReturnType<BrowserContext['storageState']>>, base: string, p: PageCase) {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 }, storageState: state })
  try {
    await context.addInitScript(observe)
    const page = await context.newPage()
    page.setDefaultTimeout(30_000)
    // The renderer's main-thread work for the load (Chrome DevTools Protocol, Performance domain): less
    // sensitive than wall-clock time to other work on a shared machine, so two builds compare fairly.
    const cdp = await context.newCDPSession(page)
    await cdp.send('Performance.enable')
    let inflight = 0
    let lastChange = Date.now()
    let requests = 0
    const counted = (url: string) => url.startsWith(base) && !url.includes('/socket.io/')
    page.on('request', (r) => {
      if (!counted(r.url())) return
      inflight++
      requests++
      lastChange = Date.now()
    })
    const done = (r: { url(): string }) => {
      if (!counted(r.url())) return
      inflight--
      lastChange = Date.now()
    }
    page.on('requestfinished', done)
    page.on('requestfailed', done)
    await page.goto(`${base}${p.path}`, { waitUntil: 'commit' })
    const selectors = p.ready
    const ready = await page.waitForFunction((sels: string[]) => {
      for (const s of sels) {
        const el = document.querySelector(s) as HTMLElement | null
        if (!el || el.offsetParent === null || el.getBoundingClientRect().height === 0) return false
      }
      return performance.now()
    }, selectors, { polling: 'raf' })
    const readyAt = (await ready.jsonValue()) as number
    // Quiet: nothing in flight and no long task for QUIET_MS.
    for (;;) {
      await page.waitForTimeout(100)
      const lt = await page.evaluate(() => {
        const w = window as unknown as { __tti: { longTaskEnd: number } }
        return performance.now() - w.__tti.longTaskEnd
      })
      if (inflight <= 0 && Date.now() - lastChange >= QUIET_MS && lt >= QUIET_MS) break
    }
    const marks = await page.evaluate(() => {
      const w = window as unknown as { __tti: { longTaskEnd: number } }
      const answers = (performance.getEntriesByType('resource') as PerformanceResourceTiming[]).filter((e) => !e.name.includes('/socket.io/'))
      const nav = performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming | undefined
      const lastAnswer = Math.max(nav?.responseEnd ?? 0, ...answers.map((e) => e.responseEnd))
      const bytes = answers.reduce((n, e) => n + (e.transferSize || 0), 0)
      const list = answers.map((e) => `${e.startTime.toFixed(0)}-${e.responseEnd.toFixed(0)} ${(e.transferSize / 1024).toFixed(1)}k ${e.name.replace(location.origin, '')}`)
      list.unshift(`navigation: request ${nav?.requestStart.toFixed(0)}, first byte ${nav?.responseStart.toFixed(0)}, end ${nav?.responseEnd.toFixed(0)}, DOMContentLoaded ${nav?.domContentLoadedEventEnd.toFixed(0)}`)
      return { longTaskEnd: w.__tti.longTaskEnd, lastAnswer, bytes, list }
    })
    if (process.env.PAGES_DEBUG) console.error(`[bench] ${p.name}: ready ${readyAt.toFixed(0)}, last long task ${marks.longTaskEnd.toFixed(0)}\n  ${marks.list.join('\n  ')}`)
    const tti = Math.max(readyAt, marks.longTaskEnd, marks.lastAnswer)
    const { metrics } = (await cdp.send('Performance.getMetrics')) as { metrics: { name: string; value: number }[] }
    const metric = (n: string) => (metrics.find((m) => m.name === n)?.value ?? NaN) * 1000
    return { tti, readyAt, requests, kB: marks.bytes / 1024, taskMs: metric('TaskDuration'), scriptMs: metric('ScriptDuration'), styleMs: metric('RecalcStyleDuration'), layoutMs: metric('LayoutDuration') }
  } finally {
    await context.close()
  }
}

export async function run(): Promise<Figure[]> {
  if (!process.env.SKIP_CLIENT_BUILD || !existsSync(resolve('dist/index.html'))) {
    console.error('[bench] pages: vite build …')
    execFileSync('npx', ['vite', 'build', '--logLevel', 'warn'], { stdio: ['ignore', 'ignore', 'inherit'] })
  }
  await benchDatabase()
  const { seedDemo } = await import('../server/seed')
  const { DEMO_PASSWORD } = await import('../server/seed/people')
  console.error('[bench] pages: demo seed …')
  await seedDemo()
  const { startServer } = await import('../server/server')
  const server = await startServer({ port: 0, clientDir: resolve('dist'), background: true })
  // PAGES_BASELINE_DIST=/path/to/another/dist[,/another]: the same pages served from other builds (say,
  // main's), measured in turn with this one, run for run, so a busy machine slows all alike.
  const baselines = []
  for (const dir of process.env.PAGES_BASELINE_DIST?.split(',').filter(Boolean) ?? []) {
    baselines.push({ dir, server: await startServer({ port: 0, clientDir: resolve(dir), background: false }) })
  }
  await waitForAnalyses()
  const { caseId, roomId } = await ids()
  const { launchBrowser } = await import('../tests/helpers/browser')
  const browser = await launchBrowser()
  const figures: Figure[] = []
  try {
    const states = new Map<string, Awaited<ReturnType<BrowserContext['storageState']>>>()
    for (const who of ['listener', 'advisor', 'supervisor']) {
      const context = await browser.newContext()
      const { token } = await (await context.request.get(`${server.url}/api/auth/csrf`)).json()
      const res = await context.request.post(`${server.url}/api/auth/login`, { headers: { 'X-CSRF-Token': token }, data: { email: `${who}@roomwright.test`, password: DEMO_PASSWORD } })
      if (!res.ok()) throw new Error(`sign-in as ${who} answered ${res.status()}`)
      states.set(who, await context.storageState())
      await context.close()
    }
    const pages: PageCase[] = [
      { name: 'advisor case workspace (plan, analyses)', who: 'advisor', path: `/desk/cases/${caseId}`, ready: ['[data-testid="page-title"]', '[data-testid="open-plan-editor"]', '[data-testid="analysis-panel"]'] },
      { name: 'plan editor', who: 'advisor', path: `/desk/cases/${caseId}/plan`, ready: ['[data-testid="plan-canvas"]', '[data-testid="plan-save"]'] },
      { name: 'room editor', who: 'listener', path: `/rooms/${roomId}`, ready: ['[data-testid="room-plan-top"]', '[data-testid="room-save"]'] },
      { name: 'supervisor dashboard', who: 'supervisor', path: '/dashboard', ready: ['[data-testid="dashboard-kpis"]', '[data-testid="chart-status"] canvas'] },
      { name: 'queue', who: 'advisor', path: '/queue', ready: ['[data-testid="queue-row"]'] },
      { name: 'listener case page (plan)', who: 'listener', path: `/cases/${caseId}`, ready: ['[data-testid="page-title"]', '[data-testid="plan-for-listener"]'] },
    ]
    // PAGES_ONLY=queue,dashboard measures only the pages whose names contain one of these words.
    const only = process.env.PAGES_ONLY?.split(',').map((x) => x.trim())
    if (only) pages.splice(0, pages.length, ...pages.filter((p) => only.some((o) => p.name.includes(o))))
    // One warm-up load of each page (the server's own caches, the database's buffers), not counted.
    for (const p of pages) await measureOnce(browser, states.get(p.who)!, server.url, p)
    const med = (xs: number[]) => percentile(xs, 50)
    for (const p of pages) {
      const runs = []
      const before = baselines.map(() => [] as Awaited<ReturnType<typeof measureOnce>>[])
      for (let i = 0; i < RUNS; i++) {
        runs.push(await measureOnce(browser, states.get(p.who)!, server.url, p))
        for (const [j, b] of baselines.entries()) before[j].push(await measureOnce(browser, states.get(p.who)!, b.server.url, p))
      }
      console.error(`[bench] pages: ${p.name}: ${runs.map((r) => r.tti.toFixed(0)).join(', ')} ms${baselines.map((b, j) => `; ${b.dir} ${before[j].map((r) => r.tti.toFixed(0)).join(', ')} ms`).join('')}`)
      type Run = Awaited<ReturnType<typeof measureOnce>>
      const push = (label: string, xs: Run[], target?: string) => {
        figures.push({ name: `${p.name}: ${label}time to interactive, median of ${RUNS} cold loads`, value: med(xs.map((r) => r.tti)), unit: 'ms', target })
        figures.push({ name: `${p.name}: ${label}ready element visible, median`, value: med(xs.map((r) => r.readyAt)), unit: 'ms' })
        figures.push({ name: `${p.name}: ${label}main-thread work (all tasks)`, value: med(xs.map((r) => r.taskMs)), unit: 'ms' })
        figures.push({ name: `${p.name}: ${label}main-thread script`, value: med(xs.map((r) => r.scriptMs)), unit: 'ms' })
        figures.push({ name: `${p.name}: ${label}main-thread style recalculation`, value: med(xs.map((r) => r.styleMs)), unit: 'ms' })
        figures.push({ name: `${p.name}: ${label}main-thread layout`, value: med(xs.map((r) => r.layoutMs)), unit: 'ms' })
        figures.push({ name: `${p.name}: ${label}requests to our server`, value: med(xs.map((r) => r.requests)), unit: 'count' })
        figures.push({ name: `${p.name}: ${label}bytes transferred`, value: med(xs.map((r) => r.kB)), unit: 'kB' })
      }
      for (const [j, b] of baselines.entries()) push(`BASELINE ${b.dir}, `, before[j])
      push('', runs, TARGET)
    }
  } finally {
    await browser.close()
  }
  return figures
}
