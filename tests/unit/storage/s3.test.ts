import { HeadObjectCommand } from '@aws-sdk/client-s3'
import { mkdtempSync, rmSync } from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import S3rver from 's3rver'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createStorage, S3Storage, type Storage } from '../../../server/storage'
import { storageContract } from './contract'

// A fake S3 (the npm package s3rver) on loopback, a random port and a temp folder, for this file only.
const dir = mkdtempSync(path.join(os.tmpdir(), 'roomwright-s3rver-'))
const BUCKET = 'roomwright-contract'
let server: S3rver
let endpoint = ''

beforeAll(async () => {
  server = new S3rver({ address: '127.0.0.1', port: 0, silent: true, directory: dir, configureBuckets: [{ name: BUCKET, configs: [] }] })
  const info = await server.run()
  endpoint = `http://127.0.0.1:${info.port}`
})
afterAll(async () => {
  await server?.close()
  rmSync(dir, { recursive: true, force: true })
})

const make = (): Storage =>
  createStorage({
    STORAGE_DRIVER: 's3',
    STORAGE_DIR: 'unused',
    S3_ENDPOINT: endpoint,
    S3_BUCKET: BUCKET,
    S3_REGION: 'us-east-1',
    S3_ACCESS_KEY_ID: 'S3RVER',
    S3_SECRET_ACCESS_KEY: 'S3RVER',
  })

storageContract('s3', make)

describe('S3 storage driver — specifics', () => {
  it('createStorage picks the S3 driver and uses path-style URLs for a loopback endpoint', async () => {
    const s = make()
    expect(s).toBeInstanceOf(S3Storage)
    expect(await (s as S3Storage).client.config.forcePathStyle).toBe(true)
  })

  it('uses virtual-host URLs for an AWS endpoint unless told otherwise', async () => {
    const aws = new S3Storage({ endpoint: 'https://s3.eu-west-1.amazonaws.com', bucket: 'b', region: 'eu-west-1' })
    expect(await aws.client.config.forcePathStyle).toBe(false)
    const forced = new S3Storage({ endpoint: 'https://s3.eu-west-1.amazonaws.com', bucket: 'b', region: 'eu-west-1', forcePathStyle: true })
    expect(await forced.client.config.forcePathStyle).toBe(true)
  })

  it('records the content type given to put', async () => {
    const s = make() as S3Storage
    await s.put('typed/photo.webp', Buffer.from('RIFF....WEBP'), { contentType: 'image/webp' })
    const head = await s.client.send(new HeadObjectCommand({ Bucket: BUCKET, Key: 'typed/photo.webp' }))
    expect(head.ContentType).toBe('image/webp')
  })

  it('refuses STORAGE_DRIVER=s3 without a bucket', () => {
    expect(() => createStorage({ STORAGE_DRIVER: 's3', STORAGE_DIR: 'x', S3_ENDPOINT: endpoint })).toThrow(/S3_BUCKET/)
  })
})
