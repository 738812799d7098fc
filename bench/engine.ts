/**
 * Bench for the room engine: a complete triage (computeRoomAnalysis) of a typical furnished listening
 * room — modes to 300 Hz, first- and second-order reflections for two speakers, notches, reverberation
 * per band, flags, the modal response at the seat and a 200-position seat search.
 * Run standalone: `npx tsx bench/engine.ts`.
 */
import { pathToFileURL } from 'node:url'
import type { RoomDescription } from '../shared/acoustics'
import { computeRoomAnalysis } from '../shared/acoustics'

export interface BenchResult {
  name: string
  value: number
  unit: string
  target?: string
}

/** Our own invented typical room: 5.6 × 3.9 × 2.45 m, furnished, two speakers and one seat. */
export const TYPICAL_ROOM: RoomDescription = {
  length: 5.6,
  width: 3.9,
  height: 2.45,
  celsius: 20,
  speakers: [
    { label: 'L', x: 0.75, y: 0.95, z: 1.0 },
    { label: 'R', x: 0.75, y: 2.95, z: 1.0 },
  ],
  seats: [{ label: 'main', x: 3.45, y: 1.95, z: 1.08 }],
  openings: [
    { wall: 'right', kind: 'window', from: 2.0, to: 3.4, bottom: 0.85, top: 2.15 },
    { wall: 'back', kind: 'door', from: 0.3, to: 1.15, bottom: 0, top: 2.0 },
  ],
  surfaces: {
    front: 'gypsum-on-studs', back: 'gypsum-on-studs', left: 'gypsum-on-studs', right: 'gypsum-on-studs',
    floor: 'heavy-carpet-on-concrete', ceiling: 'plasterboard-ceiling-on-battens',
  },
  furnishings: [
    { materialId: 'upholstered-seating-cloth', areaM2: 2.4 },
    { materialId: 'curtains-cotton-draped', areaM2: 3.0 },
  ],
  treatments: [
    { type: 'panel', surface: 'left', materialId: 'porous-panel-50mm', x: 1.9, y: 0, z: 1.05, widthM: 1.2, heightM: 0.6 },
    { type: 'panel', surface: 'right', materialId: 'porous-panel-50mm', x: 1.9, y: 3.9, z: 1.05, widthM: 1.2, heightM: 0.6 },
    { type: 'bass-trap', surface: 'front', materialId: 'porous-panel-100mm-gap-100mm', x: 0, y: 0.35, z: 1.2, widthM: 0.7, heightM: 2.4 },
    { type: 'bass-trap', surface: 'front', materialId: 'porous-panel-100mm-gap-100mm', x: 0, y: 3.55, z: 1.2, widthM: 0.7, heightM: 2.4 },
    { type: 'bass-trap', surface: 'back', materialId: 'porous-panel-150mm', x: 5.6, y: 2.6, z: 1.2, widthM: 2.0, heightM: 1.2 },
  ],
}

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
