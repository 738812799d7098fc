import { readFileSync } from 'fs'
import { modalResponse, computeRoomAnalysis, searchPositions } from './shared/acoustics'
for (const name of ['den', 'basement', 'loft']) {
  const desc = JSON.parse(readFileSync(`tests/fixtures/engine/${name}.input.json`, 'utf8'))
  const a = computeRoomAnalysis(desc)
  const rt60 = a.reverberation.bands.map((b) => ({ hz: b.hz, seconds: b.eyring }))
  const bass = desc.subwoofers?.length ? desc.subwoofers : desc.speakers
  const out = []
  for (const k of [1.25, 3, 6, 12]) {
    const t = Date.now()
    const r = modalResponse(desc, bass, desc.seats[0], { rt60, modalMaxHz: k * 300 })
    out.push(`${k}: ${r.spreadDb.toFixed(3)} (${Date.now() - t}ms)`)
  }
  const s = searchPositions(desc, bass, desc.seats[0], { rt60 })
  const check = modalResponse(desc, bass, s.seat.best.point, { rt60 }).spreadDb
  console.log(name, out.join('  '), 'search best', s.seat.best.spreadDb.toFixed(4), check.toFixed(4), 'cur', s.seat.current.spreadDb.toFixed(4))
  let t = Date.now(); for (let i = 0; i < 10; i++) computeRoomAnalysis(desc); console.log('triage ms', (Date.now() - t) / 10)
}
