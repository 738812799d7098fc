import { describe, expect, it } from 'vitest'
import { analyzeImpulseResponse, decodeWav, MeasurementFileError } from '../../../shared/signal/index'
import { addPulse, exponentialDecay, writeWav, WaveFile } from './synthetic'

function ir(sampleRate: number, seconds = 0.6, seed = 1): Float64Array {
  const x = exponentialDecay({ rt: 0.3, sampleRate, seconds, seed, startIndex: Math.round(0.003 * sampleRate) })
  for (let i = 0; i < x.length; i++) x[i] *= 0.05
  addPulse(x, sampleRate, 3, 0.8)
  addPulse(x, sampleRate, 7.5, 0.3)
  return x
}

function codeOf(fn: () => unknown): string {
  try {
    fn()
  } catch (err) {
    expect(err).toBeInstanceOf(MeasurementFileError)
    return (err as MeasurementFileError).code
  }
  throw new Error('expected a MeasurementFileError')
}

const step: Record<string, number> = { '16': 2 ** -15, '24': 2 ** -23, '32': 2 ** -31, '32f': 2 ** -24 }

describe('WAV round trips (written with wavefile, read back)', () => {
  for (const bitDepth of ['16', '24', '32', '32f'] as const) {
    for (const sampleRate of [44100, 48000, 88200, 96000]) {
      it(`${bitDepth}-bit ${bitDepth === '32f' ? 'float' : 'PCM'}, stereo, ${sampleRate} Hz: same samples within one step, same analysis`, () => {
        const left = ir(sampleRate, 0.6, 1)
        const right = ir(sampleRate, 0.6, 2).map((v) => v * 0.7)
        const wav = decodeWav(writeWav([left, right], sampleRate, bitDepth))
        expect(wav.sampleRate).toBe(sampleRate)
        expect(wav.encoding).toBe({ '16': 'pcm16', '24': 'pcm24', '32': 'pcm32', '32f': 'float32' }[bitDepth])
        expect(wav.channels.map((c) => c.label)).toEqual(['left', 'right'])
        expect(wav.durationS).toBeCloseTo(0.6, 3)
        let maxErr = 0
        for (let i = 0; i < left.length; i++) maxErr = Math.max(maxErr, Math.abs(wav.channels[0].samples[i] - left[i]), Math.abs(wav.channels[1].samples[i] - right[i]))
        expect(maxErr).toBeLessThanOrEqual(step[bitDepth])
        const a = analyzeImpulseResponse(left, sampleRate)
        const b = analyzeImpulseResponse(wav.channels[0].samples, sampleRate)
        expect(b.directSoundMs).toBeCloseTo(a.directSoundMs, 3)
        expect(b.reflections[0].delayMs).toBeCloseTo(a.reflections[0].delayMs, 2)
        b.bands.forEach((band, i) => {
          if (a.bands[i].t20 !== null && band.t20 !== null) expect(Math.abs(band.t20 / a.bands[i].t20! - 1)).toBeLessThan(0.01)
        })
        expect(b.broadband.t20).toBeCloseTo(a.broadband.t20!, 3)
        expect(wav.warnings).toEqual([])
      })
    }
  }

  it('labels a mono file "mono" and accepts a Node Buffer as well as a Uint8Array', () => {
    const bytes = writeWav([ir(48000)], 48000, '24')
    const wav = decodeWav(Buffer.from(bytes))
    expect(wav.channels.map((c) => c.label)).toEqual(['mono'])
  })
})

describe('WAV files refused with a specific error', () => {
  const good = writeWav([ir(48000)], 48000, '16')

  it('empty-file: zero bytes', () => expect(codeOf(() => decodeWav(new Uint8Array()))).toBe('empty-file'))
  it('not-wav: text, a PNG header, a RIFF file that is not WAVE', () => {
    expect(codeOf(() => decodeWav(new TextEncoder().encode('frequency_hz,spl_db\n20,70\n')))).toBe('not-wav')
    expect(codeOf(() => decodeWav(Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48])))).toBe('not-wav')
    const avi = Uint8Array.from(good)
    avi.set(new TextEncoder().encode('AVI '), 8)
    expect(codeOf(() => decodeWav(avi))).toBe('not-wav')
  })
  it('truncated: the data cut short, the header cut short', () => {
    expect(codeOf(() => decodeWav(good.slice(0, good.length - 1000)))).toBe('truncated')
    expect(codeOf(() => decodeWav(good.slice(0, 8)))).toBe('truncated')
    expect(codeOf(() => decodeWav(good.slice(0, 30)))).toBe('truncated')
    expect(() => decodeWav(good.slice(0, good.length - 1000))).toThrow(/declares \d+ bytes but only \d+ are present/)
  })
  it('no-samples: a data chunk of zero length', () => {
    expect(codeOf(() => decodeWav(writeWav([new Float64Array(0)], 48000, '16')))).toBe('no-samples')
  })
  it('unsupported-encoding: 8-bit PCM, 64-bit float, µ-law', () => {
    expect(codeOf(() => decodeWav(writeWav([ir(48000)], 48000, '8')))).toBe('unsupported-encoding')
    expect(codeOf(() => decodeWav(writeWav([ir(48000)], 48000, '64')))).toBe('unsupported-encoding')
    const mu = new WaveFile()
    mu.fromBuffer(writeWav([ir(48000)], 48000, '16'))
    mu.toMuLaw()
    expect(codeOf(() => decodeWav(mu.toBuffer()))).toBe('unsupported-encoding')
  })
  it('unsupported-sample-rate: 22.05 kHz and 192 kHz', () => {
    expect(codeOf(() => decodeWav(writeWav([ir(22050)], 22050, '16')))).toBe('unsupported-sample-rate')
    expect(() => decodeWav(writeWav([ir(22050)], 22050, '16'))).toThrow(/22050 Hz/)
    expect(codeOf(() => decodeWav(writeWav([ir(192000, 0.2)], 192000, '16')))).toBe('unsupported-sample-rate')
  })
  it('unsupported-channels: four channels', () => {
    const x = ir(48000, 0.2)
    expect(codeOf(() => decodeWav(writeWav([x, x, x, x], 48000, '16')))).toBe('unsupported-channels')
  })
  it('too-long: 31 s; too-short: 50 ms', () => {
    expect(codeOf(() => decodeWav(writeWav([new Float64Array(31 * 44100).fill(0.1)], 44100, '16')))).toBe('too-long')
    expect(codeOf(() => decodeWav(writeWav([ir(48000, 0.05)], 48000, '16')))).toBe('too-short')
  })
  it('silent: all zeros, or one silent channel of two (named)', () => {
    expect(codeOf(() => decodeWav(writeWav([new Float64Array(48000)], 48000, '24')))).toBe('silent')
    expect(() => decodeWav(writeWav([ir(48000), new Float64Array(ir(48000).length)], 48000, '24'))).toThrow(/right channel is silent/)
  })
  it('non-finite-samples: NaN or infinity in a float file, with the time', () => {
    const x = ir(48000)
    x[4800] = Number.NaN
    expect(codeOf(() => decodeWav(writeWav([x], 48000, '32f')))).toBe('non-finite-samples')
    expect(() => decodeWav(writeWav([x], 48000, '32f'))).toThrow(/NaN sample at 0\.1000 s/)
    const y = ir(48000)
    y[10] = Number.POSITIVE_INFINITY
    expect(codeOf(() => decodeWav(writeWav([y], 48000, '32f')))).toBe('non-finite-samples')
  })
})

describe('clipping is a warning, not an error', () => {
  it('warns on consecutive full-scale samples and still decodes', () => {
    const x = ir(48000)
    for (let i = 200; i < 205; i++) x[i] = 1
    const wav = decodeWav(writeWav([x], 48000, '16'))
    expect(wav.warnings.map((w) => w.code)).toEqual(['clipping'])
    expect(wav.channels[0].samples.length).toBe(x.length)
  })
  it('does not warn on a single normalised peak sample', () => {
    const x = ir(48000)
    x[144] = 1
    expect(decodeWav(writeWav([x], 48000, '24')).warnings).toEqual([])
  })
})
