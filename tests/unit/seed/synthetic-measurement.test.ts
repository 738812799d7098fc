import { describe, expect, it } from 'vitest'
import { syntheticImpulseResponse } from '../../../server/seed/synthetic-measurement'
import { demoRooms } from '../../../server/seed/rooms'
import { roomSchema } from '../../../shared/schemas/room'
import { computeRoomAnalysis } from '../../../shared/acoustics'
import { analyzeMeasurementBytes } from '../../../shared/signal'

describe('the demo measurement files (synthetic, from the engine’s own models)', () => {
  it('decode as WAV and the analysis recovers the engine’s Eyring RT at 1 kHz within 15 %', () => {
    const room = roomSchema.parse(demoRooms.good)
    const bytes = syntheticImpulseResponse(room, 'L')
    const result = analyzeMeasurementBytes(bytes, { fileName: 'demo.wav' })
    expect(result.kind).toBe('impulse-response')
    if (result.kind !== 'impulse-response') return
    const expected = computeRoomAnalysis(room).reverberation.bands.find((b) => b.hz === 1000)!.eyring
    const t30 = result.channels[0].bands.find((b) => b.centerHz === 1000)!.t30!
    expect(Math.abs(t30 - expected) / expected).toBeLessThan(0.15)
  })
  it('is the same file on every run (deterministic)', () => {
    const room = roomSchema.parse(demoRooms.square)
    expect(Buffer.from(syntheticImpulseResponse(room, 'L')).equals(Buffer.from(syntheticImpulseResponse(room, 'L')))).toBe(true)
  })
})
