import { randomUUID } from 'node:crypto'
import type { Request, RequestHandler } from 'express'
import multer, { MulterError, type StorageEngine } from 'multer'
import { Readable } from 'node:stream'
import { AppError } from '../errors'
import { assertKey, storage as configuredStorage, type Storage } from '../storage'
import { sanitiseFilename } from './filename'
import { describeRejected, heicSupported, SNIFF_BYTES, sniffFile, type SniffResult, type UploadFormat, type UploadKind } from './sniff'

const MB = 1024 * 1024

/** Largest accepted upload per kind, in bytes (issue 5: photos 15 MB, measurement files 50 MB). */
export const UPLOAD_LIMITS: Readonly<Record<UploadKind, number>> = { photo: 15 * MB, measurement: 50 * MB }

/** What a successful upload leaves on `req.file`. */
export interface UploadedFile {
  /** Temporary storage key (`incoming/<uuid>.<ext>`); keep it or `finaliseUpload` it, or `discardUpload` it on failure. */
  key: string
  /** bytes */
  size: number
  /** The client's name, sanitised (see `sanitiseFilename`); for display only. */
  originalname: string
  /** Sniffed from the bytes, never the client's Content-Type. */
  mime: string
  kind: UploadKind
  format: UploadFormat
  /** Same as `mime`, for code written against multer's field name. */
  mimetype: string
  fieldname: string
}

declare global {
  namespace Express {
    namespace Multer {
      interface File {
        key: string
        mime: string
        kind: UploadKind
        format: UploadFormat
      }
    }
  }
}

export interface UploadOptions {
  /** Which kinds this route takes; both by default. */
  kinds?: UploadKind[]
  /** Per-kind byte limits; defaults to `UPLOAD_LIMITS`. */
  limits?: Partial<Record<UploadKind, number>>
  /** Driver to write to; the configured `storage()` by default. */
  storage?: Storage
  /** Key prefix for temporary keys; `incoming` by default. */
  prefix?: string
  /** Multipart field name; `file` by default. */
  field?: string
  /** Answer 400 when the request carries no file (default true). */
  required?: boolean
}

const EXTENSION: Record<UploadFormat, string> = { jpeg: 'jpg', png: 'png', webp: 'webp', heic: 'heic', wav: 'wav', text: 'txt' }
const ACCEPTED: Record<UploadKind, string> = {
  photo: 'photos as JPEG, PNG or WebP',
  measurement: 'measurements as WAV or a plain-text frequency response',
}

const mbText = (bytes: number) => `${Math.round((bytes / MB) * 10) / 10} MB`

export const unsupportedType = (message: string) => new AppError(message, { status: 415, code: 'unsupported_type' })
export const tooLarge = (kind: UploadKind, limit: number) =>
  new AppError(`That ${kind === 'photo' ? 'photo' : 'measurement file'} is larger than ${mbText(limit)}, the most Roomwright accepts`, {
    status: 413,
    code: 'too_large',
  })

/** Reads the first `n` bytes (or the whole stream if shorter) and leaves the stream paused. */
function readHead(stream: Readable, n: number): Promise<{ head: Buffer; ended: boolean }> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    let length = 0
    const cleanup = () => {
      stream.off('data', onData)
      stream.off('end', onEnd)
      stream.off('error', onError)
      stream.off('close', onClose)
    }
    const onData = (chunk: Buffer) => {
      chunks.push(chunk)
      length += chunk.length
      if (length >= n) {
        stream.pause()
        cleanup()
        resolve({ head: Buffer.concat(chunks), ended: false })
      }
    }
    const onEnd = () => {
      cleanup()
      resolve({ head: Buffer.concat(chunks), ended: true })
    }
    const onError = (err: Error) => {
      cleanup()
      reject(err)
    }
    const onClose = () => {
      cleanup()
      reject(new AppError('The upload was cut off before the file ended', { status: 400, code: 'bad_upload' }))
    }
    stream.on('data', onData)
    stream.once('end', onEnd)
    stream.once('error', onError)
    stream.once('close', onClose)
  })
}

/** Checks a sniffed type against what the route takes; throws the 415 that explains why not. */
function admit(sniffed: SniffResult | null, head: Buffer, kinds: UploadKind[]): SniffResult {
  const wanted = kinds.map((k) => ACCEPTED[k]).join(', or ')
  if (!sniffed) {
    const seen = describeRejected(head)
    throw unsupportedType(`${seen ? `This looks like ${seen}. ` : 'Roomwright could not recognise this file from its contents. '}Please send ${wanted}.`)
  }
  if (sniffed.format === 'heic' && !heicSupported())
    throw unsupportedType('HEIC photos cannot be read on this server. Please export the photo as JPEG (on a phone: share it as "Most compatible" or JPEG) and upload that.')
  if (!kinds.includes(sniffed.kind)) throw unsupportedType(`This upload takes ${wanted}; the file is ${sniffed.kind === 'photo' ? 'a photo' : 'a measurement file'}.`)
  return sniffed
}

/**
 * A multer StorageEngine that streams one part straight into Storage: it holds only the first
 * `SNIFF_BYTES` to sniff the type, then passes chunks through while counting them, so memory
 * stays bounded whatever the file size. Nothing is stored for a refused type; an oversized or
 * broken upload has its partial object deleted before the error is reported.
 */
class StreamingEngine implements StorageEngine {
  constructor(
    private readonly target: () => Storage,
    private readonly kinds: UploadKind[],
    private readonly limits: Record<UploadKind, number>,
    private readonly prefix: string,
  ) {}

  _handleFile(_req: Request, file: Express.Multer.File, cb: (error?: unknown, info?: Partial<Express.Multer.File>) => void): void {
    this.receive(file).then(
      (info) => cb(null, info as unknown as Partial<Express.Multer.File>),
      (err) => cb(err),
    )
  }

  _removeFile(_req: Request, file: Express.Multer.File & { key?: string }, cb: (error: Error | null) => void): void {
    if (!file.key) return cb(null)
    this.target().delete(file.key).then(() => cb(null), (err: Error) => cb(err))
  }

  private async receive(file: Express.Multer.File): Promise<UploadedFile> {
    const source = file.stream as Readable
    let key: string | undefined
    const store = this.target()
    try {
      const { head, ended } = await readHead(source, SNIFF_BYTES)
      const sniffed = admit(sniffFile(head, ended), head, this.kinds)
      const limit = this.limits[sniffed.kind]
      if (head.length > limit) throw tooLarge(sniffed.kind, limit)
      key = `${this.prefix}/${randomUUID()}.${EXTENSION[sniffed.format]}`
      let size = head.length
      let refused: AppError | undefined
      const body = Readable.from(
        (async function* () {
          yield head
          if (ended) return
          // destroyOnReturn: false, or stopping early would destroy the part with an AbortError that
          // multer reports before our own reason; the catch below destroys it quietly instead
          for await (const chunk of source.iterator({ destroyOnReturn: false })) {
            size += (chunk as Buffer).length
            if (size > limit) throw (refused = tooLarge(sniffed.kind, limit))
            yield chunk as Buffer
          }
        })(),
        { objectMode: false },
      )
      // a driver may report its own abort rather than the reason the body stopped: keep ours
      const stored = await store.put(key, body, { contentType: sniffed.mime }).catch((err) => {
        throw refused ?? err
      })
      return {
        key,
        size: stored.size,
        originalname: sanitiseFilename(file.originalname),
        mime: sniffed.mime,
        kind: sniffed.kind,
        format: sniffed.format,
        mimetype: sniffed.mime,
        fieldname: file.fieldname,
      }
    } catch (err) {
      if (key) await store.delete(key).catch(() => {})
      source.destroy()
      throw err
    }
  }
}

/** Turns multer's and busboy's errors into the product's AppErrors. */
function translate(err: unknown, field: string, largest: number): unknown {
  if (err instanceof AppError) return err
  if (err instanceof MulterError) {
    switch (err.code) {
      case 'LIMIT_FILE_SIZE':
        return new AppError(`That file is larger than ${mbText(largest)}, the most Roomwright accepts`, { status: 413, code: 'too_large' })
      case 'LIMIT_FILE_COUNT':
        return new AppError('Send one file per request', { status: 400, code: 'too_many_files' })
      case 'LIMIT_UNEXPECTED_FILE':
        return new AppError(`Send the file in the form field "${field}"`, { status: 400, code: 'unexpected_field' })
      default:
        return new AppError(`The upload form is not acceptable: ${err.message}`, { status: 400, code: 'bad_upload' })
    }
  }
  const message = (err as Error)?.message ?? ''
  if (/Unexpected end of form|Malformed part header|Multipart: Boundary not found|Request (aborted|closed)/i.test(message))
    return new AppError('The upload was cut off or malformed; please try again', { status: 400, code: 'bad_upload' })
  return err
}

/**
 * Express middleware for one multipart upload in field `file`: sniffs the type from the bytes,
 * enforces the per-kind size limit, streams the bytes into Storage under a temporary key and,
 * only when all of that succeeded, sets `req.file` (an `UploadedFile`). Errors: 415
 * `unsupported_type`, 413 `too_large`, 400 `missing_file` / `too_many_files` / `unexpected_field` / `bad_upload`.
 */
export function uploadFile(opts: UploadOptions = {}): RequestHandler {
  const kinds = opts.kinds ?? (['photo', 'measurement'] as UploadKind[])
  const limits = { ...UPLOAD_LIMITS, ...opts.limits }
  const field = opts.field ?? 'file'
  const prefix = opts.prefix ?? 'incoming'
  assertKey(`${prefix}/x`)
  const target = () => opts.storage ?? configuredStorage()
  const largest = Math.max(...kinds.map((k) => limits[k]))
  const parse = multer({
    storage: new StreamingEngine(target, kinds, limits, prefix),
    // busboy's own cut-off sits 1 MB past ours so the engine's per-kind 413 is the one reported
    limits: { files: 1, fileSize: largest + MB, fields: 20, fieldSize: 64 * 1024, parts: 25, headerPairs: 200 },
    defParamCharset: 'utf8',
  }).single(field)
  return (req, res, next) => {
    parse(req, res, (err?: unknown) => {
      if (err) return next(translate(err, field, largest))
      if (!req.file && opts.required !== false)
        return next(new AppError(`Attach a file in the multipart form field "${field}"`, { status: 400, code: 'missing_file' }))
      next()
    })
  }
}

/** The upload `uploadFile()` left on the request; throws 400 when there is none. */
export function uploadedFile(req: Request): UploadedFile {
  const f = req.file as unknown as UploadedFile | undefined
  if (!f?.key) throw new AppError('No file was uploaded', { status: 400, code: 'missing_file' })
  return f
}
