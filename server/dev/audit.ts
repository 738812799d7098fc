/**
 * CI's dependency audit: `npm audit` over the production dependencies; fails on any high or critical
 * advisory. When the registry's advisory endpoint cannot be reached (a closed network answers 405 or
 * nothing), it says so plainly and does not fail the build: no answer is not a clean bill of health,
 * and the line in the CI log shows which it was.
 */
import { spawnSync } from 'node:child_process'

const r = spawnSync('npm', ['audit', '--omit=dev', '--json'], { encoding: 'utf8', timeout: 120_000 })
let report: { metadata?: { vulnerabilities?: Record<string, number> }; statusCode?: number; message?: string; error?: unknown } = {}
try {
  report = JSON.parse(r.stdout || '{}')
} catch {
  /* not JSON: treated as unreachable below */
}
const v = report.metadata?.vulnerabilities
if (!v) {
  console.log(`[audit] the advisory database did not answer (${report.statusCode ?? report.message ?? (r.error ? String(r.error) : 'no report')}); dependency audit NOT performed`)
  process.exit(0)
}
const high = (v.high ?? 0) + (v.critical ?? 0)
console.log(`[audit] production dependencies: ${v.critical ?? 0} critical, ${v.high ?? 0} high, ${v.moderate ?? 0} moderate, ${v.low ?? 0} low`)
if (high > 0) {
  console.log('[audit] failing: high or critical advisories in production dependencies (npm audit --omit=dev for details)')
  process.exit(1)
}
