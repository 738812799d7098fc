import { createRequire } from 'node:module'
import { percentile } from './db'

/** The options of autocannon this bench uses (autocannon ships no TypeScript types). */
export interface CannonOptions {
  url: string
  connections: number
  duration: number
  method?: string
  headers?: Record<string, string>
  body?: string | Buffer
  requests?: { method?: string; path?: string; headers?: Record<string, string>; body?: string | Buffer; setupRequest?: (req: { path: string }) => { path: string } }[]
}
interface Instance extends PromiseLike<{ requests: { total: number; average: number }; errors: number; non2xx: number; timeouts: number }> {
  on(event: 'response', fn: (client: unknown, status: number, bytes: number, ms: number) => void): void
}
const autocannon = createRequire(import.meta.url)('autocannon') as (o: object) => Instance

export interface CannonResult { requests: number; errors: number; non2xx: number; timeouts: number; p50: number; p95: number; p99: number; rps: number }

/** One autocannon run; latencies of every response are kept, so p95 is exact (autocannon itself reports p97.5). */
export async function cannon(opts: CannonOptions): Promise<CannonResult> {
  const times: number[] = []
  const instance = autocannon({ timeout: 10, ...opts })
  instance.on('response', (_c, _status, _bytes, ms) => times.push(ms))
  const r = await instance
  return {
    requests: r.requests.total, errors: r.errors, non2xx: r.non2xx, timeouts: r.timeouts,
    p50: percentile(times, 50), p95: percentile(times, 95), p99: percentile(times, 99), rps: r.requests.average,
  }
}
