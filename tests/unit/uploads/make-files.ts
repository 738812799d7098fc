/** Real files made on the spot for the upload tests: images by sharp, WAV by wavefile, text by hand. */
import sharp from 'sharp'
import wavefile from 'wavefile'
import { crc32, deflateSync } from 'node:zlib'

export async function jpeg(width = 320, height = 200, opts: { orientation?: number } = {}): Promise<Buffer> {
  let img = sharp({ create: { width, height, channels: 3, background: { r: 180, g: 120, b: 60 } } }).jpeg({ quality: 80 })
  if (opts.orientation) img = img.withMetadata({ orientation: opts.orientation })
  return img.toBuffer()
}
export const png = (width = 64, height = 48) =>
  sharp({ create: { width, height, channels: 4, background: { r: 10, g: 200, b: 90, alpha: 0.5 } } }).png().toBuffer()
export const webp = (lossless = false) =>
  sharp({ create: { width: 40, height: 30, channels: 3, background: { r: 0, g: 0, b: 255 } } }).webp({ lossless }).toBuffer()
export const avif = () => sharp({ create: { width: 16, height: 16, channels: 3, background: '#808080' } }).avif().toBuffer()
export const gif = () => sharp({ create: { width: 16, height: 16, channels: 3, background: '#ff0000' } }).gif().toBuffer()

/** A 16-bit PCM WAV: a 1 kHz tone of `seconds` at `rate` Hz, written by the wavefile package. */
export function wav(seconds = 0.05, rate = 48_000, channels = 1): Buffer {
  const n = Math.round(seconds * rate)
  const samples = Array.from({ length: channels }, () => Array.from({ length: n }, (_, i) => Math.round(8000 * Math.sin((2 * Math.PI * 1000 * i) / rate))))
  const w = new wavefile.WaveFile()
  w.fromScratch(channels, rate, '16', channels === 1 ? samples[0] : samples)
  return Buffer.from(w.toBuffer())
}

/** The same WAV with an extra chunk (e.g. `LIST`, `bext`) between the RIFF header and `fmt `. */
export function wavWithLeadingChunk(id: string, payload: Buffer): Buffer {
  const plain = wav()
  const pad = payload.length % 2 ? Buffer.alloc(1) : Buffer.alloc(0)
  const header = Buffer.alloc(8)
  header.write(id, 0, 'latin1')
  header.writeUInt32LE(payload.length, 4)
  const out = Buffer.concat([plain.subarray(0, 12), header, payload, pad, plain.subarray(12)])
  out.writeUInt32LE(out.length - 8, 4)
  return out
}

/**
 * An RF64 file made from a plain WAV: `RF64`, size 0xFFFFFFFF, `WAVE`, a 28-byte `ds64` chunk
 * holding the real sizes, then `fmt ` and `data` (size 0xFFFFFFFF). @see EBU Tech 3306 (2009)
 */
export function rf64(): Buffer {
  const plain = wav()
  const ds64 = Buffer.alloc(8 + 28)
  ds64.write('ds64', 0, 'latin1')
  ds64.writeUInt32LE(28, 4)
  const rest = plain.subarray(12)
  ds64.writeBigUInt64LE(BigInt(4 + ds64.length + rest.length), 8)
  const dataAt = rest.indexOf('data')
  const dataSize = rest.readUInt32LE(dataAt + 4)
  ds64.writeBigUInt64LE(BigInt(dataSize), 16)
  ds64.writeBigUInt64LE(BigInt(dataSize / 2), 24)
  const body = Buffer.from(rest)
  body.writeUInt32LE(0xffffffff, dataAt + 4)
  const head = Buffer.from('RF64\xff\xff\xff\xffWAVE', 'latin1')
  return Buffer.concat([head, ds64, body])
}

/** A frequency response as text: a header, then `frequency level phase` rows, 1/12-octave from 20 Hz. */
export function responseText(rows = 120, sep = '\t'): Buffer {
  const lines = ['# Roomwright test response, made in the test', '# frequency_hz level_db phase_deg']
  for (let i = 0; i < rows; i++) {
    const f = 20 * 2 ** (i / 12)
    lines.push([f.toFixed(3), (75 + 6 * Math.sin(i / 5)).toFixed(2), (-90 + i).toFixed(1)].join(sep))
  }
  return Buffer.from(lines.join('\n') + '\n', 'utf8')
}

/** A HEIC-branded file start: an ISO-BMFF `ftyp` box with major brand heic (ISO/IEC 23008-12), then filler. */
export function heicHead(): Buffer {
  const ftyp = Buffer.alloc(24)
  ftyp.writeUInt32BE(24, 0)
  ftyp.write('ftypheic', 4, 'latin1')
  ftyp.writeUInt32BE(0, 12)
  ftyp.write('mif1heic', 16, 'latin1')
  return Buffer.concat([ftyp, Buffer.alloc(200, 0)])
}

function pngChunk(type: string, data: Buffer): Buffer {
  const len = Buffer.alloc(4)
  len.writeUInt32BE(data.length)
  const td = Buffer.concat([Buffer.from(type, 'latin1'), data])
  const crc = Buffer.alloc(4)
  crc.writeUInt32BE(crc32(td) >>> 0)
  return Buffer.concat([len, td, crc])
}

/**
 * A decompression bomb: a valid PNG whose header claims `width` × `height` pixels (8-bit grey)
 * with a few rows of compressed zeros behind it. @see ISO/IEC 15948 (PNG): IHDR, IDAT, IEND, CRC-32
 */
export function pngBomb(width = 60_000, height = 60_000): Buffer {
  const ihdr = Buffer.alloc(13)
  ihdr.writeUInt32BE(width, 0)
  ihdr.writeUInt32BE(height, 4)
  ihdr[8] = 8 // bit depth
  ihdr[9] = 0 // greyscale
  const rows = deflateSync(Buffer.alloc((width + 1) * 4))
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk('IHDR', ihdr),
    pngChunk('IDAT', rows),
    pngChunk('IEND', Buffer.alloc(0)),
  ])
}

/** Pseudo-random filler (xorshift32). */
export function noise(bytes: number, seed = 12345): Buffer {
  const out = Buffer.alloc(bytes)
  let x = seed >>> 0 || 1
  for (let i = 0; i < bytes; i++) {
    x ^= x << 13; x >>>= 0
    x ^= x >>> 17
    x ^= x << 5; x >>>= 0
    out[i] = x & 0xff
  }
  return out
}

export interface Part {
  field: string
  filename?: string
  contentType?: string
  body: Buffer | string
}

/**
 * A multipart/form-data body built by hand, so file names reach the server exactly as written
 * (form-data, which supertest uses, strips path parts itself). @see RFC 7578
 */
export function multipart(parts: Part[]): { body: Buffer; contentType: string } {
  const boundary = `----roomwright-test-${Math.random().toString(16).slice(2)}`
  const chunks: Buffer[] = []
  for (const p of parts) {
    const disposition = `form-data; name="${p.field}"${p.filename !== undefined ? `; filename="${p.filename.replace(/"/g, '%22')}"` : ''}`
    const headers = [`Content-Disposition: ${disposition}`, ...(p.contentType ? [`Content-Type: ${p.contentType}`] : [])]
    chunks.push(Buffer.from(`--${boundary}\r\n${headers.join('\r\n')}\r\n\r\n`, 'utf8'), Buffer.isBuffer(p.body) ? p.body : Buffer.from(p.body), Buffer.from('\r\n'))
  }
  chunks.push(Buffer.from(`--${boundary}--\r\n`))
  return { body: Buffer.concat(chunks), contentType: `multipart/form-data; boundary=${boundary}` }
}
