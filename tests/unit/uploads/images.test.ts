import { mkdtempSync, rmSync } from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import sharp from 'sharp'
import { afterAll, describe, expect, it } from 'vitest'
import { LocalStorage } from '../../../server/storage'
import { imageInfo, makeThumbnail, MAX_IMAGE_PIXELS, thumbnailKey, THUMBNAIL_WIDTH } from '../../../server/uploads'
import * as make from './make-files'

const root = mkdtempSync(path.join(os.tmpdir(), 'roomwright-images-'))
afterAll(() => rmSync(root, { recursive: true, force: true }))
const storage = new LocalStorage(root)
let n = 0
async function stored(bytes: Buffer, ext: string): Promise<string> {
  const key = `cases/3/photo-${n++}.${ext}`
  await storage.put(key, bytes)
  return key
}

describe('thumbnailKey', () => {
  it.each([
    ['cases/3/a.jpg', 'cases/3/a.thumb.webp'],
    ['incoming/0f.png', 'incoming/0f.thumb.webp'],
    ['x/no-extension', 'x/no-extension.thumb.webp'],
    ['dir.v2/file', 'dir.v2/file.thumb.webp'],
  ])('%s → %s', (k, t) => expect(thumbnailKey(k)).toBe(t))
})

describe('makeThumbnail', () => {
  it(`a 1600 × 900 JPEG gets a ${THUMBNAIL_WIDTH} px wide WebP beside it, aspect kept`, async () => {
    const key = await stored(await make.jpeg(1600, 900), 'jpg')
    const thumb = await makeThumbnail(key, { storage })
    expect(thumb).toBe(thumbnailKey(key))
    const meta = await sharp(await storage.getBuffer(thumb)).metadata()
    expect(meta.format).toBe('webp')
    expect(meta.width).toBe(THUMBNAIL_WIDTH)
    expect(meta.height).toBe(Math.round((900 * THUMBNAIL_WIDTH) / 1600))
  })

  it('never enlarges a small image', async () => {
    const key = await stored(await make.png(120, 80), 'png')
    const meta = await sharp(await storage.getBuffer(await makeThumbnail(key, { storage }))).metadata()
    expect([meta.width, meta.height]).toEqual([120, 80])
  })

  it('applies EXIF orientation: a 800 × 600 JPEG tagged "rotate 90°" (orientation 6) becomes a portrait thumbnail', async () => {
    const key = await stored(await make.jpeg(800, 600, { orientation: 6 }), 'jpg')
    expect(await imageInfo(key, { storage })).toEqual({ width: 600, height: 800, format: 'jpeg' })
    const meta = await sharp(await storage.getBuffer(await makeThumbnail(key, { storage }))).metadata()
    expect(meta.width).toBe(400)
    expect(meta.height).toBe(533)
  })

  it('a decompression bomb (a PNG claiming 60 000 × 60 000 px) is refused with 413 before decoding, and no thumbnail is stored', async () => {
    const bomb = make.pngBomb()
    expect(bomb.length).toBeLessThan(100_000)
    const key = await stored(bomb, 'png')
    expect(60_000 * 60_000).toBeGreaterThan(MAX_IMAGE_PIXELS)
    await expect(makeThumbnail(key, { storage })).rejects.toMatchObject({ status: 413, code: 'image_too_large' })
    await expect(imageInfo(key, { storage })).rejects.toMatchObject({ status: 413, code: 'image_too_large' })
    expect(await storage.exists(thumbnailKey(key))).toBe(false)
  })

  it('the pixel limit is a parameter: a 200 × 100 image is refused under a 10 000 px limit and passes under 20 000', async () => {
    const key = await stored(await make.png(200, 100), 'png')
    await expect(makeThumbnail(key, { storage, maxPixels: 10_000 })).rejects.toMatchObject({ status: 413 })
    await expect(makeThumbnail(key, { storage, maxPixels: 20_000 })).resolves.toBe(thumbnailKey(key))
  })

  it('bytes that are not an image answer 415 unreadable_image', async () => {
    const key = await stored(make.noise(5000), 'jpg')
    await expect(makeThumbnail(key, { storage })).rejects.toMatchObject({ status: 415, code: 'unreadable_image' })
    await expect(imageInfo(key, { storage })).rejects.toMatchObject({ status: 415 })
  })

  it('a truncated JPEG (header fine, data cut in half) answers 415, not a half-grey thumbnail', async () => {
    const full = await sharp({ create: { width: 900, height: 600, channels: 3, background: '#808080', noise: { type: 'gaussian', mean: 128, sigma: 40 } } }).jpeg().toBuffer()
    const key = await stored(full.subarray(0, Math.floor(full.length / 2)), 'jpg')
    await expect(makeThumbnail(key, { storage })).rejects.toMatchObject({ status: 415 })
    expect(await storage.exists(thumbnailKey(key))).toBe(false)
  })

  it('a missing original is a 404', async () => {
    await expect(makeThumbnail('cases/3/missing.jpg', { storage })).rejects.toMatchObject({ status: 404 })
  })
})

describe('imageInfo', () => {
  it('reads width and height of PNG and WebP', async () => {
    expect(await imageInfo(await stored(await make.png(64, 48), 'png'), { storage })).toEqual({ width: 64, height: 48, format: 'png' })
    expect(await imageInfo(await stored(await make.webp(), 'webp'), { storage })).toEqual({ width: 40, height: 30, format: 'webp' })
  })
})
