import sharp from 'sharp'
import { describe, expect, it } from 'vitest'
import { describeRejected, heicSupported, SNIFF_BYTES, sniffFile } from '../../../server/uploads'
import * as make from './make-files'

describe('sniffFile — photos from their magic numbers', () => {
  it('a JPEG made by sharp is a photo/jpeg (SOI FF D8 FF, ISO/IEC 10918-1)', async () => {
    expect(sniffFile(await make.jpeg())).toEqual({ mime: 'image/jpeg', kind: 'photo', format: 'jpeg' })
  })
  it('a PNG made by sharp is a photo/png (8-byte signature, ISO/IEC 15948)', async () => {
    expect(sniffFile(await make.png())).toEqual({ mime: 'image/png', kind: 'photo', format: 'png' })
  })
  it('lossy (VP8) and lossless (VP8L) WebP are photo/webp (RIFF….WEBP, Google WebP container spec)', async () => {
    expect(sniffFile(await make.webp(false))).toEqual({ mime: 'image/webp', kind: 'photo', format: 'webp' })
    expect(sniffFile(await make.webp(true))?.format).toBe('webp')
  })
  it('an ftyp box with brand heic is photo/heic (ISO/IEC 23008-12); an AVIF made by sharp is not', async () => {
    expect(sniffFile(make.heicHead())).toEqual({ mime: 'image/heic', kind: 'photo', format: 'heic' })
    const avif = await make.avif()
    expect(sniffFile(avif)).toBeNull()
    expect(describeRejected(avif)).toBe('an AVIF image')
  })
  it('heicSupported follows what the installed sharp can read', () => {
    const suffixes: string[] = sharp.format.heif?.input?.fileSuffix ?? []
    expect(heicSupported()).toBe(suffixes.includes('.heic'))
  })
  it('a GIF made by sharp is refused and named', async () => {
    const g = await make.gif()
    expect(sniffFile(g)).toBeNull()
    expect(describeRejected(g)).toBe('a GIF image')
  })
  it('two bytes of a JPEG are not enough to call it one', async () => {
    expect(sniffFile((await make.jpeg()).subarray(0, 2))).toBeNull()
  })
})

describe('sniffFile — measurement files', () => {
  it('a 16-bit PCM WAV written by wavefile is measurement/wav, mono and stereo', () => {
    expect(sniffFile(make.wav())).toEqual({ mime: 'audio/wav', kind: 'measurement', format: 'wav' })
    expect(sniffFile(make.wav(0.01, 44_100, 2))?.format).toBe('wav')
  })
  it('an RF64 file (EBU Tech 3306: RF64, ds64 then fmt) is measurement/wav', () => {
    expect(sniffFile(make.rf64())?.format).toBe('wav')
  })
  it('a WAV with a LIST chunk before fmt is still found by walking the chunks', () => {
    expect(sniffFile(make.wavWithLeadingChunk('LIST', Buffer.from('INFOISFT\u0005\u0000\u0000\u0000test\u0000', 'latin1')))?.format).toBe('wav')
  })
  it('"RIFF….WAVE" followed by text is not a WAV: there is no fmt chunk', () => {
    const fake = Buffer.from('RIFF\u0024\u0000\u0000\u0000WAVEthis is just text pretending to be audio, nothing more', 'latin1')
    expect(sniffFile(fake)).toBeNull()
    expect(describeRejected(fake)).toMatch(/WAV/)
  })
  it('a WAV whose fmt chunk holds an absurd sample rate (10 Hz) is refused', () => {
    const w = make.wav()
    const fmt = w.indexOf('fmt ')
    w.writeUInt32LE(10, fmt + 12)
    expect(sniffFile(w)).toBeNull()
  })
  it('a WAV head cut inside its fmt chunk is refused', () => {
    expect(sniffFile(make.wav().subarray(0, 30), true)).toBeNull()
  })
  it('a tab-, comma- or blank-separated frequency response text is measurement/text', () => {
    for (const sep of ['\t', ',', ' ', ';']) expect(sniffFile(make.responseText(50, sep)), JSON.stringify(sep)).toEqual({ mime: 'text/plain', kind: 'measurement', format: 'text' })
  })
  it('a response text with a UTF-8 BOM, CRLF line ends and scientific notation is accepted', () => {
    const t = '\ufeffFrequency, level\r\n2.0e1, 7.1e1\r\n2.5E+01, 71.5\r\n31.5, 72\r\n'
    expect(sniffFile(Buffer.from(t, 'utf8'))?.format).toBe('text')
  })
  it('prose is not a frequency response, even named .wav', () => {
    const prose = Buffer.from('This is not a recording. The bass booms at the sofa\nand the left wall has a window.\n')
    expect(sniffFile(prose)).toBeNull()
  })
  it(`fewer than three data rows is not a response`, () => {
    expect(sniffFile(Buffer.from('# two rows\n20 70\n25 71\n'))).toBeNull()
    expect(sniffFile(Buffer.from('# three rows\n20 70\n25 71\n31.5 72\n'))?.format).toBe('text')
  })
  it('a zero or negative first column is not a frequency', () => {
    expect(sniffFile(Buffer.from('0 1\n-5 2\n0 3\n'))).toBeNull()
  })
  it('a NUL byte, another control byte, or a bidi override makes it not text', () => {
    const good = make.responseText(10).toString('utf8')
    expect(sniffFile(Buffer.from(good.replace('20.000', '20.000\u0000'), 'utf8'))).toBeNull()
    expect(sniffFile(Buffer.from(good.replace('# ', '#\u0007 '), 'utf8'))).toBeNull()
    expect(sniffFile(Buffer.from(good.replace('# ', '#\u202e '), 'utf8'))).toBeNull()
  })
  it('bytes that are not valid UTF-8 (a Latin-1 degree sign) are not text', () => {
    const latin1 = Buffer.concat([Buffer.from('# phase in \xb0\n', 'latin1'), make.responseText(10)])
    expect(sniffFile(latin1)).toBeNull()
  })
  it('a multi-byte character cut by the end of the sniffed head does not spoil the text; at the real end of the file it does', () => {
    const whole = Buffer.concat([make.responseText(10), Buffer.from('# costs \u20ac 90\n', 'utf8')])
    const cut = whole.subarray(0, whole.indexOf(Buffer.from('\u20ac', 'utf8')) + 1)
    expect(sniffFile(cut, false)?.format).toBe('text')
    expect(sniffFile(cut, true)).toBeNull()
    expect(sniffFile(whole, true)?.format).toBe('text')
  })
  it('a head exactly SNIFF_BYTES long counts as possibly incomplete by default (a cut character is allowed)', () => {
    let pad = ''
    let head: Buffer
    do {
      const text = Buffer.concat([make.responseText(10), Buffer.from(`#${pad}${'\u20ac'.repeat(30_000)}\n`, 'utf8')])
      head = text.subarray(0, SNIFF_BYTES)
      pad += ' '
    } while (new TextDecoder().decode(head).endsWith('\u20ac')) // until the cut falls inside a euro sign
    expect(sniffFile(head)?.format).toBe('text')
    expect(sniffFile(head, true)).toBeNull()
  })
  it('an empty file is nothing', () => {
    expect(sniffFile(Buffer.alloc(0))).toBeNull()
  })
})

describe('sniffFile — the bytes win over the name', () => {
  it('sniffFile never sees a name: a PNG is a photo whatever it is called; text stays text', async () => {
    const p = await make.png()
    expect(sniffFile(p)?.kind).toBe('photo')
    expect(sniffFile(make.responseText())?.kind).toBe('measurement')
  })
  it('does not mutate the head it is given', async () => {
    const j = await make.jpeg()
    const copy = Buffer.from(j)
    sniffFile(j)
    expect(j.equals(copy)).toBe(true)
  })
})
