/**
 * Bench for the room engine: a complete triage (computeRoomAnalysis) of a typical furnished listening
 * room — modes to 300 Hz, first- and second-order reflections for two speakers, notches, reverberation
 * per band, flags, the modal response at the seat and a 200-position seat search.
 * Run standalone: `npx tsx bench/engine.ts`.
 */
import { pathToFileURL } from 'node:url'
import type { RoomDescription } from '../shared/acoustics'
import { computeRoomAnalysis } from '../shared/acoustics'
import typicalRoom from './data/typical-room.json'

export interface BenchResult {
  name: string
  value: number
  unit: string
  target?: string
}

/** Our own invented typical room (bench/data/typical-room.json): 5.6 × 3.9 × 2.45 m, furnished, two speakers and one seat. */
export const TYPICAL_ROOM = typicalRoom as unknown as RoomDescription

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))]
}

export async function run(): Promise<BenchResult[]> {
  const once = () => computeRoomAnalysis(TYPICAL_ROOM, { seatPositions: 200 })
  for (let i = 0; i < 15; i++) once() // let the JIT settle
  const times: number[] = []
  let last = once()
  for (let i = 0; i < 40; i++) {
    const t0 = performance.now()
    last = once()
    times.push(performance.now() - t0)
  }
  times.sort((a, b) => a - b)
  return [
    { name: 'complete triage, median', value: +percentile(times, 0.5).toFixed(2), unit: 'ms', target: '< 20 ms' },
    { name: 'complete triage, fastest', value: +times[0].toFixed(2), unit: 'ms', target: '< 20 ms' },
    { name: 'complete triage, 90th percentile', value: +percentile(times, 0.9).toFixed(2), unit: 'ms' },
    { name: 'modes listed', value: last.modes.length, unit: `modes to ${Math.round(last.modesMaxHz)} Hz` },
    { name: 'seat positions searched', value: last.seat.positionSearch.seat.scan.length, unit: 'positions' },
  ]
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  void run().then((rows) => {
    const w = Math.max(...rows.map((r) => r.name.length))
    for (const r of rows) console.log(`${r.name.padEnd(w)}  ${String(r.value).padStart(8)} ${r.unit}${r.target ? `  (target ${r.target})` : ''}`)
  })
}
