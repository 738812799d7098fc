import sharp from 'sharp'

export type UploadKind = 'photo' | 'measurement'
export type UploadFormat = 'jpeg' | 'png' | 'webp' | 'heic' | 'wav' | 'text'

export interface SniffResult {
  mime: string
  kind: UploadKind
  format: UploadFormat
}

/** How many leading bytes the sniffer wants; enough for a WAV's `fmt ` chunk behind a long `bext`/`iXML` chunk. */
export const SNIFF_BYTES = 64 * 1024

const ascii = (b: Buffer, start: number, end: number) => b.toString('latin1', start, end)

const HEIC_BRANDS = new Set(['heic', 'heix', 'heim', 'heis', 'hevc', 'hevx', 'hevm', 'hevs'])
const AVIF_BRANDS = new Set(['avif', 'avis'])

/** ISO-BMFF `ftyp` brands (major + compatible) of a HEIF-family file, or null. */
function ftypBrands(head: Buffer): string[] | null {
  if (head.length < 16 || ascii(head, 4, 8) !== 'ftyp') return null
  const boxSize = head.readUInt32BE(0)
  if (boxSize < 16 || boxSize > 4096) return null
  const end = Math.min(boxSize, head.length)
  const brands = [ascii(head, 8, 12)]
  for (let i = 16; i + 4 <= end; i += 4) brands.push(ascii(head, i, i + 4))
  return brands
}

/**
 * A WAV file: RIFF/RF64 container of form WAVE whose `fmt ` chunk (found by walking the chunk
 * list inside `head`) holds a plausible PCM or float format.
 * @see Microsoft/IBM, Multimedia Programming Interface and Data Specifications 1.0 (1991), RIFF WAVE
 * @see EBU Tech 3306, MBWF/RF64 (2009): `RF64` id, size 0xFFFFFFFF, `ds64` chunk first
 */
function isWave(head: Buffer): boolean {
  if (head.length < 12) return false
  const id = ascii(head, 0, 4)
  if ((id !== 'RIFF' && id !== 'RF64') || ascii(head, 8, 12) !== 'WAVE') return false
  let pos = 12
  while (pos + 8 <= head.length) {
    const chunk = ascii(head, pos, pos + 4)
    if (!/^[\x20-\x7e]{4}$/.test(chunk)) return false
    const size = head.readUInt32LE(pos + 4)
    if (chunk === 'fmt ') {
      if (size < 16 || pos + 24 > head.length) return false
      const tag = head.readUInt16LE(pos + 8)
      const channels = head.readUInt16LE(pos + 10)
      const rate = head.readUInt32LE(pos + 12)
      const bits = head.readUInt16LE(pos + 22)
      // 1 = PCM, 3 = IEEE float, 0xFFFE = WAVE_FORMAT_EXTENSIBLE
      return [1, 3, 0xfffe].includes(tag) && channels >= 1 && channels <= 64 && rate >= 1000 && rate <= 1_536_000 && bits >= 8 && bits <= 64
    }
    if (chunk === 'data') return false
    pos += 8 + size + (size % 2)
  }
  return false
}

/** Control characters a text file may not hold: C0 except TAB/LF/FF/CR, DEL, C1, and bidi overrides. */
const FORBIDDEN_TEXT = /[\u0000-\u0008\u000b\u000e-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/
const NUMBER = '[-+]?(?:\\d+\\.?\\d*|\\.\\d+)(?:[eE][-+]?\\d+)?'
/** A data row: frequency then at least one more number, separated by blanks, tabs, commas or semicolons. */
const DATA_ROW = new RegExp(`^\\s*(${NUMBER})(?:\\s*[,;\\t]\\s*|\\s+)${NUMBER}(?:(?:\\s*[,;\\t]\\s*|\\s+)${NUMBER})*\\s*[,;]?\\s*$`)

/** The smallest number of data rows a frequency-response text must show in its first bytes. */
export const MIN_RESPONSE_ROWS = 3

/**
 * A plain-text frequency response: valid UTF-8 (a multi-byte character cut by the end of
 * `head` is allowed), no NUL or other control bytes, and at least 3 rows of
 * `frequency value [value …]` with a positive frequency; other lines (headers, comments) may sit between.
 */
function isResponseText(head: Buffer, complete: boolean): boolean {
  if (head.length === 0) return false
  let text: string
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(head, { stream: !complete })
  } catch {
    return false
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1)
  if (FORBIDDEN_TEXT.test(text)) return false
  const lines = text.split(/\r\n|\r|\n/)
  if (!complete && lines.length > 1) lines.pop() // the last line may be cut short by the end of head
  let rows = 0
  for (const line of lines) {
    const m = DATA_ROW.exec(line)
    if (m && Number(m[1]) > 0) rows++
    if (rows >= MIN_RESPONSE_ROWS) return true
  }
  return false
}

/**
 * The type of an upload from its first bytes alone (never its name or the client's Content-Type),
 * or null when it is none Roomwright accepts. Magic numbers are checked by hand for these few
 * formats: `file-type` 22 needs Node 22, older majors would add a dependency for six checks, and
 * neither would know a frequency-response text file.
 * @param head the first bytes of the file (`SNIFF_BYTES` of them, or the whole file if shorter)
 * @param complete true when `head` is the whole file (lets the text check read its last line)
 * @see ISO/IEC 10918-1 (JPEG SOI + marker FF D8 FF); ISO/IEC 15948 (PNG signature);
 *   Google, WebP Container Specification (RIFF….WEBP); ISO/IEC 23008-12 (HEIF `ftyp` brands)
 */
export function sniffFile(head: Buffer, complete = head.length < SNIFF_BYTES): SniffResult | null {
  if (head.length >= 3 && head[0] === 0xff && head[1] === 0xd8 && head[2] === 0xff) return { mime: 'image/jpeg', kind: 'photo', format: 'jpeg' }
  if (head.length >= 8 && head.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])))
    return { mime: 'image/png', kind: 'photo', format: 'png' }
  if (head.length >= 16 && ascii(head, 0, 4) === 'RIFF' && ascii(head, 8, 12) === 'WEBP' && /^VP8[ LX]$/.test(ascii(head, 12, 16)))
    return { mime: 'image/webp', kind: 'photo', format: 'webp' }
  const brands = ftypBrands(head)
  if (brands && brands.some((b) => HEIC_BRANDS.has(b)) && !AVIF_BRANDS.has(brands[0])) return { mime: 'image/heic', kind: 'photo', format: 'heic' }
  if (isWave(head)) return { mime: 'audio/wav', kind: 'measurement', format: 'wav' }
  if (isResponseText(head, complete)) return { mime: 'text/plain', kind: 'measurement', format: 'text' }
  return null
}

/** A short name for common files Roomwright does not take, so a refusal can say what it saw. */
export function describeRejected(head: Buffer): string | null {
  const brands = ftypBrands(head)
  if (brands?.some((b) => AVIF_BRANDS.has(b))) return 'an AVIF image'
  if (brands && ['qt  ', 'isom', 'mp41', 'mp42', 'M4V ', 'M4A '].includes(brands[0])) return 'a video or audio (MP4/MOV) file'
  const a = ascii(head, 0, 12)
  if (a.startsWith('GIF8')) return 'a GIF image'
  if (a.startsWith('%PDF')) return 'a PDF document'
  if (a.startsWith('BM')) return 'a BMP image'
  if (a.startsWith('II*\u0000') || a.startsWith('MM\u0000*')) return 'a TIFF image'
  if (a.startsWith('PK\u0003\u0004')) return 'a ZIP archive'
  if (a.startsWith('fLaC')) return 'a FLAC file'
  if (a.startsWith('OggS')) return 'an Ogg file'
  if (a.startsWith('ID3') || (head[0] === 0xff && (head[1] & 0xe0) === 0xe0)) return 'an MP3 file'
  if ((a.startsWith('RIFF') || a.startsWith('RF64')) && a.endsWith('WAVE')) return 'a WAV file whose format header is missing or unusual'
  return null
}

let heicReadable: boolean | undefined
/** Whether this machine's sharp/libvips can decode HEIC (HEVC) images; prebuilt sharp reads only AVIF from the HEIF family. */
export function heicSupported(): boolean {
  heicReadable ??= Boolean(sharp.format.heif?.input?.fileSuffix?.some((s: string) => s.toLowerCase() === '.heic'))
  return heicReadable
}
