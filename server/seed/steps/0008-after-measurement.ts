import { randomUUID } from 'node:crypto'
import { Op } from 'sequelize'
import { models } from '../../db/models'
import { findRoom } from '../../data/rooms'
import { addCaseFile } from '../../services/files'
import { storage } from '../../storage'
import { applyPlan } from '../../../shared/plan'
import { planBodySchema } from '../../../shared/schemas/plan'
import { demoPerson } from '../case-script'
import { demoRooms } from '../rooms'
import { syntheticImpulseResponse } from '../synthetic-measurement'

/**
 * The demo listener's "plan sent" case (step 0005) gets a measurement made after the plan was sent: a
 * synthetic impulse response of her room with the plan's changes made, so the before/after comparison
 * on her case page has a before (her measurements from the chair) and a distinct after. Only the file is
 * added, as an upload without a message (a reply would move the case back to review).
 */
export async function seed(): Promise<void> {
  const maren = await demoPerson('listener@roomwright.test')
  const { Case, Room, TreatmentPlan, File } = models()
  const room = await Room.findOne({ attributes: ['id'], where: { ownerId: maren.id, name: demoRooms.smallStudio.name } })
  if (!room) return
  const c = await Case.findOne({ attributes: ['id', 'roomId', 'roomRevision'], where: { listenerId: maren.id, roomId: room.id, status: 'plan_sent' } })
  if (!c) return
  const plan = await TreatmentPlan.findOne({ attributes: ['body', 'sentAt'], where: { caseId: c.id }, order: [['version', 'DESC']] })
  if (!plan?.sentAt) return
  if (await File.count({ where: { caseId: c.id, kind: 'measurement', createdAt: { [Op.gt]: plan.sentAt } } })) return
  const stored = (await findRoom(c.roomId, c.roomRevision))!.room
  const after = applyPlan(stored, planBodySchema.parse(plan.body))
  const bytes = syntheticImpulseResponse(after, 'L', { seed: 2100 })
  const key = `incoming/${randomUUID()}.wav`
  await storage().put(key, Buffer.from(bytes))
  await addCaseFile(maren, c.id, {
    key, size: bytes.length, originalname: 'left-monitor-at-chair-after-the-traps (synthetic demo).wav',
    mime: 'audio/wav', mimetype: 'audio/wav', kind: 'measurement', format: 'wav', fieldname: 'file',
  })
}
