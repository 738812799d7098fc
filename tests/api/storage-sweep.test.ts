import { afterAll, describe, expect, it } from 'vitest'
import { mkdtempSync, existsSync, utimesSync, writeFileSync, mkdirSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { randomUUID } from 'node:crypto'
import { closeTestApp, signedIn, testApp } from '../helpers/api'
import { LocalStorage } from '../../server/storage'
import { sweepStorage } from '../../server/storage/sweep'
import { models } from '../helpers/rows'

afterAll(closeTestApp)

const HOUR = 3600_000
function leftover(root: string, key: string, ageMs: number): string {
  const file = join(root, ...key.split('/'))
  mkdirSync(join(file, '..'), { recursive: true })
  writeFileSync(file, 'left behind by a crash')
  const t = new Date(Date.now() - ageMs)
  utimesSync(file, t, t)
  return file
}

describe('storage sweep: what a crash mid-upload leaves behind', () => {
  it('removes old .tmp leftovers, unfinalised incoming uploads and case files without a row; keeps recent ones and files with a row', async () => {
    testApp()
    const root = mkdtempSync(join(tmpdir(), 'roomwright-sweep-'))
    const store = new LocalStorage(root)
    // a real file row, whose bytes must stay
    const { user } = await signedIn('listener')
    const caseId = randomUUID()
    const kept = `cases/${caseId}/${randomUUID()}.png`
    const tmpOld = leftover(root, `.tmp/${randomUUID()}`, 2 * HOUR)
    const tmpNew = leftover(root, `.tmp/${randomUUID()}`, 60_000)
    const incomingOld = leftover(root, `incoming/${randomUUID()}.wav`, 2 * HOUR)
    const incomingNew = leftover(root, `incoming/${randomUUID()}.wav`, 60_000)
    const orphanOld = leftover(root, `cases/${caseId}/${randomUUID()}.jpg`, 2 * HOUR)
    const orphanNew = leftover(root, `cases/${caseId}/${randomUUID()}.jpg`, 60_000)
    const withRow = leftover(root, kept, 2 * HOUR)
    // the row: files.storage_key names `kept`
    await makeCaseWithFile(user.id, kept)

    const result = await sweepStorage({ store })
    expect(result).toEqual({ temp: 1, incoming: 1, orphans: 1 })
    expect([existsSync(tmpOld), existsSync(incomingOld), existsSync(orphanOld)]).toEqual([false, false, false])
    expect([existsSync(tmpNew), existsSync(incomingNew), existsSync(orphanNew), existsSync(withRow)]).toEqual([true, true, true, true])
  })
})

async function makeCaseWithFile(userId: string, key: string) {
  const { createRoom } = await import('../../server/services/rooms')
  const { createCase } = await import('../../server/services/cases')
  const { testRoom } = await import('../helpers/rooms')
  const { roomSchema } = await import('../../shared/schemas/room')
  const { findUserById } = await import('../../server/data/users')
  const u = (await findUserById(userId))!
  const user = { id: u.id, email: u.email, name: u.name, role: u.role }
  const room = await createRoom(user, roomSchema.parse(testRoom()))
  const c = await createCase(user, { roomId: room.id, title: 'Sweep case', description: '', answers: {} } as never)
  await models().File.create({ caseId: c.id, uploaderId: userId, kind: 'photo', originalName: 'kept.png', mime: 'image/png', size: 22, storageKey: key, thumbKey: null, analysisStatus: null })
  return c
}
