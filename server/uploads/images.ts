import sharp, { type Metadata } from 'sharp'
import { AppError } from '../errors'
import { storage as configuredStorage, type Storage } from '../storage'

/** Thumbnail width in pixels. */
export const THUMBNAIL_WIDTH = 400

/**
 * Largest image Roomwright decodes, in pixels (width × height): 100 MP, about twice a 50 MP camera
 * frame. Anything larger in a ≤ 15 MB file is a decompression bomb. `IMAGE_MAX_PIXELS` overrides it.
 */
export const MAX_IMAGE_PIXELS = Number(process.env.IMAGE_MAX_PIXELS ?? '') > 0 ? Number(process.env.IMAGE_MAX_PIXELS) : 100_000_000

export interface ImageOptions {
  storage?: Storage
  /** pixels; defaults to `MAX_IMAGE_PIXELS` */
  maxPixels?: number
}

export interface ImageInfo {
  /** pixels, as displayed (EXIF orientation applied) */
  width: number
  /** pixels, as displayed (EXIF orientation applied) */
  height: number
  /** sharp's name for the decoded format: jpeg, png, webp, heif … */
  format: string
}

/** Where the thumbnail of `key` lives: beside it, `a/b.jpg` → `a/b.thumb.webp`. */
export function thumbnailKey(key: string): string {
  const slash = key.lastIndexOf('/')
  const dot = key.lastIndexOf('.')
  const base = dot > slash ? key.slice(0, dot) : key
  return `${base}.thumb.webp`
}

const unreadable = () => new AppError('Roomwright could not read this image; please send it again as JPEG or PNG', { status: 415, code: 'unreadable_image' })

async function readHeader(buf: Buffer, maxPixels: number): Promise<ImageInfo> {
  let meta: Metadata
  try {
    meta = await sharp(buf, { limitInputPixels: false }).metadata()
  } catch {
    throw unreadable()
  }
  if (!meta.width || !meta.height) throw unreadable()
  const pixels = meta.width * meta.height
  if (pixels > maxPixels)
    throw new AppError(
      `This image is ${meta.width} × ${meta.height} pixels (${Math.round(pixels / 1e6)} MP); Roomwright reads images up to ${Math.round(maxPixels / 1e6)} MP`,
      { status: 413, code: 'image_too_large' },
    )
  const turned = (meta.orientation ?? 1) >= 5
  return { width: turned ? meta.height : meta.width, height: turned ? meta.width : meta.height, format: meta.format ?? 'unknown' }
}

/** Width and height of a stored image, read from its header without decoding the pixels. */
export async function imageInfo(key: string, opts: ImageOptions = {}): Promise<ImageInfo> {
  const store = opts.storage ?? configuredStorage()
  return readHeader(await store.getBuffer(key), opts.maxPixels ?? MAX_IMAGE_PIXELS)
}

/**
 * Makes a WebP thumbnail about 400 px wide (never enlarged, EXIF orientation applied) beside the
 * stored image and returns its key. The pixel count is checked from the header first and again by
 * sharp's `limitInputPixels`, so a decompression bomb is refused before it is decoded.
 */
export async function makeThumbnail(key: string, opts: ImageOptions & { width?: number } = {}): Promise<string> {
  const store = opts.storage ?? configuredStorage()
  const maxPixels = opts.maxPixels ?? MAX_IMAGE_PIXELS
  const source = await store.getBuffer(key) // photos are capped at 15 MB by the upload limit
  await readHeader(source, maxPixels)
  let thumb: Buffer
  try {
    thumb = await sharp(source, { limitInputPixels: maxPixels, sequentialRead: true, failOn: 'error' })
      .rotate()
      .resize({ width: opts.width ?? THUMBNAIL_WIDTH, withoutEnlargement: true })
      .webp({ quality: 78 })
      .toBuffer()
  } catch (err) {
    if (/pixel limit/i.test((err as Error)?.message ?? ''))
      throw new AppError(`This image has more than ${Math.round(maxPixels / 1e6)} MP`, { status: 413, code: 'image_too_large' })
    throw unreadable()
  }
  const out = thumbnailKey(key)
  await store.put(out, thumb, { contentType: 'image/webp' })
  return out
}
