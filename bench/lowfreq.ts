/**
 * Bench: the four-subwoofer search for a typical room and a sofa of three seats, in the worker pool
 * (as POST /api/rooms/subwoofers runs it), and the measured-peak diagnosis of a 3 s impulse response.
 * Target (issue 17): the search under 2 s in the worker pool.
 * Run alone with `npx tsx bench/lowfreq.ts`, or through `run()`.
 */
import { pathToFileURL } from 'node:url'
import { createAnalysisPool } from '../server/analysis/pool'
import { runSubwooferSearch } from '../server/analysis/service'
import { explainLowFrequencyPeaks } from '../shared/signal/index'
import type { RoomDescription } from '../shared/acoustics/triage'

export interface BenchFigure { name: string; value: number; unit: string; target?: string }

const room: RoomDescription = {
  length: 5.8, width: 4.1, height: 2.5, celsius: 21,
  speakers: [{ label: 'L', x: 0.9, y: 1.1, z: 1.0 }, { label: 'R', x: 0.9, y: 3.0, z: 1.0 }],
  seats: [{ label: 'Sofa left', x: 3.6, y: 1.45, z: 1.1 }, { label: 'Sofa middle', x: 3.6, y: 2.05, z: 1.1 }, { label: 'Sofa right', x: 3.6, y: 2.65, z: 1.1 }],
  surfaces: { front: 'gypsum-on-studs', back: 'gypsum-on-studs', left: 'plaster-on-masonry', right: 'plaster-on-masonry', floor: 'wood-floor-on-joists', ceiling: 'plasterboard-ceiling-on-battens' },
}

const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)]

function modalIr(fs: number): Float64Array {
  const x = new Float64Array(3 * fs)
  const c = 343.8
  for (let a = 0; a < 8; a++) for (let b = 0; b < 6; b++) for (let d = 0; d < 4; d++) {
    if (a + b + d === 0) continue
    const hz = (c / 2) * Math.hypot(a / room.length, b / room.width, d / room.height)
    if (hz > 250) continue
    const amp = Math.cos((a * Math.PI * 3.6) / room.length) * Math.cos((b * Math.PI * 1.45) / room.width) * Math.cos((d * Math.PI * 1.1) / room.height)
    const dmp = (3 * Math.LN10) / 0.5
    for (let i = 0; i < x.length; i++) x[i] += amp * Math.exp((-dmp * i) / fs) * Math.sin((2 * Math.PI * hz * i) / fs)
  }
  return x
}

export async function run(): Promise<BenchFigure[]> {
  const pool = createAnalysisPool({ maxThreads: 1 })
  const times: number[] = []
  try {
    await runSubwooferSearch({ room, counts: [1] }, { pool }) // start the worker (tsx, module load)
    for (let i = 0; i < 5; i++) {
      const t = performance.now()
      await runSubwooferSearch({ room, counts: [4] }, { pool })
      times.push(performance.now() - t)
    }
  } finally {
    await pool.destroy()
  }
  const all: number[] = []
  const p2 = createAnalysisPool({ maxThreads: 1 })
  try {
    await runSubwooferSearch({ room, counts: [1] }, { pool: p2 })
    for (let i = 0; i < 3; i++) {
      const t = performance.now()
      await runSubwooferSearch({ room }, { pool: p2 })
      all.push(performance.now() - t)
    }
  } finally {
    await p2.destroy()
  }
  const fs = 48000
  const ir = modalIr(fs)
  const diag: number[] = []
  for (let i = 0; i < 3; i++) {
    const t = performance.now()
    explainLowFrequencyPeaks({ samples: ir, sampleRate: fs }, room, room.speakers[0], room.seats[0])
    diag.push(performance.now() - t)
  }
  return [
    { name: 'subwoofer search, 4 subwoofers, 3 seats, 5.8 × 4.1 m, worker pool, median', value: median(times), unit: 'ms', target: '< 2000 ms' },
    { name: 'subwoofer search, 1 + 2 + 4 subwoofers, 3 seats, worker pool, median', value: median(all), unit: 'ms' },
    { name: 'measured-peak diagnosis of a 3 s, 48 kHz impulse response, median', value: median(diag), unit: 'ms' },
  ]
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  for (const f of await run()) console.log(`${f.name}: ${f.value.toFixed(1)} ${f.unit}${f.target ? ` (target ${f.target})` : ''}`)
}
