import { randomUUID } from 'node:crypto'
import { Op } from 'sequelize'
import { models } from '../../db/models'
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
  const cases = (await models().Case.findAll({
    attributes: ['id', 'roomId', 'roomRevision', 'title', 'createdAt'], where: { status: { [Op.ne]: 'draft' } },
    include: [{ association: 'listener', attributes: ['email'], where: { email: ['listener@roomwright.test', 'jonas.mbeki@roomwright.test', 'felix.aduya@roomwright.test'] }, required: true }],
    order: [['createdAt', 'ASC']],
  })).map((c) => ({ id: c.id, room_id: c.roomId, room_revision: c.roomRevision, email: c.listener!.email, title: c.title }))
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
