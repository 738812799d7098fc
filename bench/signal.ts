/**
 * Bench: the full measurement analysis of a 10 s, 48 kHz mono impulse response.
 * Targets (issue 4): under 250 ms on one core, under 100 MB above the baseline.
 * Run alone with `npx tsx bench/signal.ts`, or through `run()`.
 */
import { pathToFileURL } from 'node:url'
import { analyzeMeasurement } from '../shared/signal/index'
import { addPulse, exponentialDecay } from '../tests/unit/signal/synthetic'

export interface BenchFigure {
  name: string
  value: number
  unit: string
  target?: string
}

function syntheticIr(): Float64Array {
  const fs = 48000
  const x = exponentialDecay({ rt: 0.6, sampleRate: fs, seconds: 10, seed: 1, startIndex: 240, noiseMeanSquare: 1e-12 })
  for (let i = 0; i < x.length; i++) x[i] *= 0.05
  addPulse(x, fs, 5, 0.9)
  addPulse(x, fs, 9, 0.4)
  return x
}

const usedBytes = () => {
  const m = process.memoryUsage()
  return m.heapUsed + m.arrayBuffers
}

export async function run(): Promise<BenchFigure[]> {
  const fs = 48000
  const ir = syntheticIr()
  const gc = (globalThis as { gc?: () => void }).gc
  gc?.()
  const baseline = usedBytes()
  const baselineRss = process.memoryUsage().rss

  let peak = 0
  const sampler = setInterval(() => (peak = Math.max(peak, usedBytes())), 1)
  const t0 = performance.now()
  analyzeMeasurement(ir, fs)
  const firstMs = performance.now() - t0
  peak = Math.max(peak, usedBytes())
  clearInterval(sampler)

  const times: number[] = []
  for (let i = 0; i < 5; i++) {
    const t = performance.now()
    analyzeMeasurement(ir, fs)
    times.push(performance.now() - t)
    peak = Math.max(peak, usedBytes())
  }
  times.sort((a, b) => a - b)
  const rssAbove = process.memoryUsage().rss - baselineRss
  return [
    { name: 'full analysis, 10 s 48 kHz mono IR (median of 5, warm)', value: Math.round(times[2] * 10) / 10, unit: 'ms', target: '< 250 ms' },
    { name: 'full analysis, first (cold) run', value: Math.round(firstMs * 10) / 10, unit: 'ms' },
    { name: 'memory above baseline (JS heap + array buffers, peak)', value: Math.round(((peak - baseline) / 2 ** 20) * 10) / 10, unit: 'MB', target: '< 100 MB' },
    { name: 'resident set growth over the bench', value: Math.round((rssAbove / 2 ** 20) * 10) / 10, unit: 'MB' },
  ]
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  for (const f of await run()) console.log(`${f.name}: ${f.value} ${f.unit}${f.target ? ` (target ${f.target})` : ''}`)
}
