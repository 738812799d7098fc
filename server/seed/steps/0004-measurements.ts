import { randomUUID } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import { db } from '../../db/sequelize'
import { findUserByEmail, toPublicUser } from '../../data/users'
import { findRoom } from '../../data/rooms'
import { storage } from '../../storage'
import { addCaseFile } from '../../services/files'
import { syntheticImpulseResponse } from '../synthetic-measurement'

/**
 * Demo measurement files, generated from the engine's own room models (see synthetic-measurement.ts):
 * synthetic impulse responses, not recordings. They go through the same upload service and analysis job
 * as a listener's files.
 */
export async function seed(): Promise<void> {
  const cases = await db().query<{ id: string; room_id: string; room_revision: number; email: string; title: string }>(
    `SELECT c.id, c.room_id, c.room_revision, u.email, c.title FROM cases c JOIN users u ON u.id = c.listener_id
      WHERE u.email IN ('listener@roomwright.test', 'jonas.mbeki@roomwright.test', 'felix.aduya@roomwright.test') AND c.status <> 'draft'
      ORDER BY c.created_at`,
    { type: QueryTypes.SELECT },
  )
  for (const c of cases) {
    const owner = await findUserByEmail(c.email)
    const room = await findRoom(c.room_id, c.room_revision)
    if (!owner || !room) continue
    const labels = c.email.startsWith('jonas') ? ['L', 'R'] : ['L']
    for (const [i, label] of labels.entries()) {
      const bytes = syntheticImpulseResponse(room.room, label, { seed: 1000 + i })
      const key = `incoming/${randomUUID()}.wav`
      await storage().put(key, Buffer.from(bytes))
      await addCaseFile(toPublicUser(owner), c.id, {
        key, size: bytes.length, originalname: `${label === 'L' ? 'left' : 'right'}-speaker-at-seat (synthetic demo).wav`,
        mime: 'audio/wav', mimetype: 'audio/wav', kind: 'measurement', format: 'wav', fieldname: 'file',
      })
    }
  }
}
