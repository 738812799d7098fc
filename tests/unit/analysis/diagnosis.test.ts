import { afterAll, describe, expect, it } from 'vitest'
import { createAnalysisPool } from '../../../server/analysis/pool'
import { analyzeMeasurementFile } from '../../../server/analysis/service'
import type { FrequencyResponseFileAnalysis, ImpulseResponseFileAnalysis } from '../../../shared/signal/index'
import { writeWav } from '../signal/synthetic'
import { modalIr } from '../signal/modal-synthetic'

const pool = createAnalysisPool({ maxThreads: 1 })
afterAll(async () => {
  await pool.destroy()
})

const stated = { length: 5.0, width: 3.8, height: 2.6 }
const left = { x: 0.35, y: 0.4, z: 0.35 }
const right = { x: 0.35, y: 3.4, z: 0.35 }
const seat = { x: 3.9, y: 1.2, z: 1.3 }

describe('the measurement analysis explains the low-frequency peaks where the room is known', () => {
  it('an impulse response of a room 0.3 m longer than stated: each channel carries the diagnosis, the length estimate within 10 cm (Rayleigh closed form)', async () => {
    const x = modalIr({ ...stated, length: 5.3 }, left, seat, { rt: 0.8, sampleRate: 48_000, seconds: 3 })
    let peak = 0
    for (const v of x) peak = Math.max(peak, Math.abs(v))
    for (let i = 0; i < x.length; i++) x[i] *= 0.9 / peak
    const result = (await analyzeMeasurementFile({ bytes: writeWav([x], 48_000, '24'), fileName: 'seat.wav', diagnosis: { room: stated, seat, left, right } }, { pool })) as ImpulseResponseFileAnalysis
    const d = result.channels[0].lowFrequencyDiagnosis!
    expect(d.source).toBe('left')
    expect(d.sourcePoint).toEqual(left)
    expect(Math.abs(d.dimensionEstimate!.length - 5.3)).toBeLessThan(0.1)
  }, 60_000)

  it('a frequency-response file gets one diagnosis (no fall times); without the room there is none', async () => {
    const text = 'frequency_hz,spl_db\n' + Array.from({ length: 120 }, (_, i) => { const f = 20 * 2 ** (i / 24); return `${f},${70 + 8 * Math.exp(-(((f - 34.3) / 1.5) ** 2))}` }).join('\n')
    const r = (await analyzeMeasurementFile({ bytes: Buffer.from(text), fileName: 'seat.csv', diagnosis: { room: stated, seat, left, right } }, { pool })) as FrequencyResponseFileAnalysis
    const p = r.lowFrequencyDiagnosis!.peaks.find((q) => Math.abs(q.hz - 34.3) < 1)!
    expect(p.cause).toMatchObject({ kind: 'mode', indices: [1, 0, 0] })
    expect(p.fall30Ms).toBeNull()
    const bare = (await analyzeMeasurementFile({ bytes: Buffer.from(text), fileName: 'seat.csv' }, { pool })) as FrequencyResponseFileAnalysis
    expect(bare.lowFrequencyDiagnosis).toBeUndefined()
  }, 60_000)
})
