import '../mail/setup-config'
import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { decodeWav, MeasurementFileError, parseFrequencyResponse, parseFrequencyResponseBytes, analyzeMeasurementBytes } from '../../../shared/signal/index'
import { sniffFile, sanitiseFilename, MAX_FILENAME_LENGTH } from '../../../server/uploads'
import { renderMarkdownSafe } from '../../../server/mail/templates'
import { writeWav, exponentialDecay } from '../signal/synthetic'
import { fcParams, fuzzTimeout, unsafeHtml, xssCorpus } from './helpers'

/** Longest one parse of a small file may take, ms: far above a normal parse (a few ms), far below a hang. */
const SLOW_MS = 2_000

/** Runs `fn`; it must return or throw a MeasurementFileError, and do so quickly. */
function returnsOrRefuses(fn: () => unknown): void {
  const t0 = performance.now()
  try {
    fn()
  } catch (e) {
    if (!(e instanceof MeasurementFileError)) throw new Error(`threw ${(e as Error)?.name}: ${(e as Error)?.message}`)
    expect(e.code).toMatch(/^[a-z0-9-]+$/)
    expect(e.message.length).toBeGreaterThan(10)
  }
  const ms = performance.now() - t0
  if (ms > SLOW_MS) throw new Error(`took ${ms.toFixed(0)} ms`)
}

const validWav = (() => {
  const x = exponentialDecay({ rt: 0.3, sampleRate: 44_100, seconds: 0.15, seed: 3, startIndex: 40 })
  return { pcm16: Buffer.from(writeWav([x], 44_100, '16')), stereo24: Buffer.from(writeWav([x, x], 44_100, '24')), float: Buffer.from(writeWav([x], 48_000, '32f')) }
})()

const validResponse = (() => {
  const rows = ['# made in the test', 'frequency_hz,spl_db,phase_deg']
  for (let i = 0; i < 60; i++) rows.push(`${(20 * 2 ** (i / 6)).toFixed(2)},${(70 + 5 * Math.sin(i)).toFixed(2)},${(i * 3 - 90).toFixed(1)}`)
  return rows.join('\n') + '\n'
})()

/** A byte-level mutation of a valid file: flips, overwrites (also of 32-bit size fields), cuts, inserts and repeats. */
const mutation = (size: number) =>
  fc.oneof(
    fc.record({ kind: fc.constant('set' as const), at: fc.nat(size - 1), byte: fc.integer({ min: 0, max: 255 }) }),
    fc.record({ kind: fc.constant('u32' as const), at: fc.nat(Math.max(0, size - 4)), value: fc.oneof(fc.constantFrom(0, 1, 0x7fffffff, 0xffffffff, 0xfffffffe), fc.nat()) }),
    fc.record({ kind: fc.constant('cut' as const), at: fc.nat(size) }),
    fc.record({ kind: fc.constant('insert' as const), at: fc.nat(size), bytes: fc.uint8Array({ maxLength: 64 }) }),
    fc.record({ kind: fc.constant('repeat' as const), at: fc.nat(size - 1), length: fc.integer({ min: 1, max: 64 }), times: fc.integer({ min: 1, max: 50 }) }),
  )
type Mutation = typeof mutation extends (n: number) => fc.Arbitrary<infer M> ? M : never

function mutate(input: Buffer, ms: Mutation[]): Buffer {
  let b = Buffer.from(input)
  for (const m of ms) {
    const at = Math.min(m.at, Math.max(0, b.length - 1))
    if (m.kind === 'set' && b.length) b[at] = m.byte
    else if (m.kind === 'u32' && b.length >= at + 4) b.writeUInt32LE(m.value >>> 0, at)
    else if (m.kind === 'cut') b = b.subarray(0, m.at)
    else if (m.kind === 'insert') b = Buffer.concat([b.subarray(0, at), Buffer.from(m.bytes), b.subarray(at)])
    else if (m.kind === 'repeat') {
      const piece = b.subarray(at, at + m.length)
      b = Buffer.concat([b.subarray(0, at), ...Array(m.times).fill(piece), b.subarray(at)])
    }
  }
  return b
}

describe('decodeWav — arbitrary bytes and mutations of valid files', () => {
  it('arbitrary bytes (and arbitrary bytes behind a RIFF/WAVE header) return or throw MeasurementFileError, quickly', () => {
    const riff = fc.uint8Array({ maxLength: 4096 }).map((rest) => Buffer.concat([Buffer.from('RIFF\x00\x10\x00\x00WAVEfmt ', 'latin1'), Buffer.from(rest)]))
    fc.assert(fc.property(fc.oneof(fc.uint8Array({ maxLength: 4096 }).map((u) => Buffer.from(u)), riff), (bytes) => returnsOrRefuses(() => decodeWav(bytes))), fcParams(300))
  }, fuzzTimeout())
  it('mutated valid WAV files (16-bit mono, 24-bit stereo, float) return or throw MeasurementFileError, quickly', () => {
    const file = fc.constantFrom(validWav.pcm16, validWav.stereo24, validWav.float)
    fc.assert(fc.property(file.chain((f) => fc.tuple(fc.constant(f), fc.array(mutation(f.length), { minLength: 1, maxLength: 6 }))), ([f, ms]) => returnsOrRefuses(() => decodeWav(mutate(f, ms)))), fcParams(300))
  }, fuzzTimeout())
  it('the whole analysis of a mutated WAV returns or refuses with MeasurementFileError', () => {
    fc.assert(fc.property(fc.array(mutation(validWav.pcm16.length), { minLength: 1, maxLength: 4 }), (ms) => returnsOrRefuses(() => analyzeMeasurementBytes(mutate(validWav.pcm16, ms), { fileName: 'ir.wav' }))), fcParams(60))
  }, fuzzTimeout())
})

describe('parseFrequencyResponse — arbitrary text and mutations of a valid table', () => {
  it('arbitrary bytes return or throw MeasurementFileError, quickly', () => {
    fc.assert(fc.property(fc.uint8Array({ maxLength: 4096 }), (u) => returnsOrRefuses(() => parseFrequencyResponseBytes(u))), fcParams(300))
  }, fuzzTimeout())
  it('arbitrary unicode text, and text built from table-like tokens, return or throw MeasurementFileError', () => {
    const token = fc.constantFrom('frequency_hz', 'spl_db', 'phase_deg', ',', ' ', '\t', '\n', '\r\n', '#', '-', '+', '.', 'e', 'E', '1e309', 'NaN', 'Infinity', '20', '20000', '0', '\uFEFF', '\u0000', '1'.repeat(400))
    const tabley = fc.array(token, { maxLength: 300 }).map((t) => t.join(''))
    fc.assert(fc.property(fc.oneof(fc.string({ unit: 'binary', maxLength: 2000 }), tabley), (s) => returnsOrRefuses(() => parseFrequencyResponse(s))), fcParams(300))
  }, fuzzTimeout())
  it('a mutated valid table returns or throws MeasurementFileError; when it parses, frequencies ascend within 20–20 000 Hz', () => {
    const bytes = Buffer.from(validResponse)
    fc.assert(
      fc.property(fc.array(mutation(bytes.length), { minLength: 1, maxLength: 6 }), (ms) => {
        const m = mutate(bytes, ms)
        let parsed: ReturnType<typeof parseFrequencyResponseBytes> | undefined
        returnsOrRefuses(() => (parsed = parseFrequencyResponseBytes(m)))
        if (parsed) {
          expect(parsed.freqsHz.length).toBe(parsed.splDb.length)
          for (let i = 1; i < parsed.freqsHz.length; i++) expect(parsed.freqsHz[i]).toBeGreaterThan(parsed.freqsHz[i - 1])
          expect(parsed.freqsHz[0]).toBeGreaterThanOrEqual(20)
          expect(parsed.freqsHz.at(-1)!).toBeLessThanOrEqual(20_000)
        }
      }),
      fcParams(300),
    )
  }, fuzzTimeout())
  it('the whole analysis of a mutated table returns or refuses with MeasurementFileError', () => {
    const bytes = Buffer.from(validResponse)
    fc.assert(fc.property(fc.array(mutation(bytes.length), { minLength: 1, maxLength: 4 }), (ms) => returnsOrRefuses(() => analyzeMeasurementBytes(mutate(bytes, ms), { fileName: 'fr.txt' }))), fcParams(100))
  }, fuzzTimeout())
})

describe('upload sniffing and file names — arbitrary input', () => {
  it('sniffFile never throws and names only the accepted types', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 2048 }), fc.boolean(), (u, complete) => {
        const r = sniffFile(Buffer.from(u), complete)
        if (r) expect(['image/jpeg', 'image/png', 'image/webp', 'image/heic', 'audio/wav', 'text/plain']).toContain(r.mime)
      }),
      fcParams(500),
    )
  }, fuzzTimeout())
  it('sanitiseFilename keeps no path part, control or bidi character, leading dot, and at most 200 characters', () => {
    // found by the nightly run: dots and blanks in turn ('.\t.', '. .bashrc') left a leading dot
    expect(sanitiseFilename('.\t.')).toBe('upload')
    expect(sanitiseFilename('. .bashrc')).toBe('bashrc')
    const piece = fc.constantFrom('../', '..\\', '/etc/passwd', 'C:\\Windows\\', '\u0000', '\u202e', '\u2066', '\r\n', '\t', '.', ' ', 'photo.jpg', '%2e%2e%2f', '\u00e9', '😀')
    const name = fc.oneof(fc.string({ unit: 'binary', maxLength: 400 }), fc.array(piece, { maxLength: 40 }).map((p) => p.join('')))
    fc.assert(
      fc.property(name, (n) => {
        const s = sanitiseFilename(n)
        expect(s.length).toBeGreaterThan(0)
        expect([...s].length).toBeLessThanOrEqual(MAX_FILENAME_LENGTH)
        expect(s).not.toMatch(/[\\/]/)
        expect(s).not.toMatch(/[\u0000-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/)
        expect(s.startsWith('.')).toBe(false)
        expect(sanitiseFilename(s)).toBe(s)
      }),
      fcParams(500),
    )
  }, fuzzTimeout())
})

describe('renderMarkdownSafe — the XSS corpus and generated payloads', () => {
  const corpus = xssCorpus()
  it('the corpus file holds enough distinct payload shapes', () => {
    expect(corpus.length).toBeGreaterThanOrEqual(70)
  })
  it('no payload of the corpus leaves a script, an event handler, an inline style or a non-http(s) URL', () => {
    const bad = corpus.map((p) => ({ p, problems: unsafeHtml(renderMarkdownSafe(p)) })).filter((x) => x.problems.length)
    expect(bad).toEqual([])
  })
  it('the checker itself catches each kind of problem (so the test above can fail)', () => {
    expect(unsafeHtml('<script>x</script>')).toEqual(['<script>'])
    expect(unsafeHtml('<img src=x onerror=alert(1)>')).toEqual(['img[onerror]'])
    expect(unsafeHtml('<a href="&#x6A;avascript:alert(1)">x</a>')).toHaveLength(1)
    expect(unsafeHtml('<a href="java&#x09;script:alert(1)">x</a>')).toHaveLength(1)
    expect(unsafeHtml('<a href="https://example.test/">x</a><a href="/cases/1">y</a><a href="mailto:a@b.test">z</a>')).toEqual([])
  })
  it('payloads of the corpus mixed into ordinary markdown, split and joined at random, stay safe', async () => {
    const prose = fc.constantFrom('The bass at **45 Hz** swells.', '- move the sofa\n- add a rug', '> quoted line', '`code`', '[link](https://example.test/)', '\n\n', ' ', '<', '>', '"', "'", '=', '&#', ':', 'javascript', 'on', 'error')
    const piece = fc.oneof(fc.constantFrom(...corpus), prose, fc.string({ maxLength: 20 }))
    // async, yielding each run: jsdom frees a parsed document's state only when the event loop turns
    await fc.assert(fc.asyncProperty(fc.array(piece, { minLength: 1, maxLength: 12 }), async (parts) => {
      expect(unsafeHtml(renderMarkdownSafe(parts.join('')))).toEqual([])
      await new Promise((r) => setImmediate(r))
    }), fcParams(200))
  }, fuzzTimeout())
})
