import { randomUUID } from 'node:crypto'
import { models } from '../../db/models'
import { findRoom } from '../../data/rooms'
import { postMessage } from '../../services/messages'
import { createPlan, sendPlan } from '../../services/plans'
import { addCaseFile } from '../../services/files'
import { storage } from '../../storage'
import { demoRooms } from '../rooms'
import { demoPlanBody } from '../demo-plan'
import { syntheticImpulseResponse } from '../synthetic-measurement'
import { demoPerson, playCase } from '../case-script'

/**
 * The demo listeners' "plan sent" cases get the plan that was sent: Felix's garden studio (sent in
 * step 0002 without one) and a new case of Maren's (the demo listener), so a newcomer signing in as
 * her sees a plan with its predicted before/after, measurements with their analyses and the thread
 * that led there. Written through the same services people use.
 */
export async function seed(): Promise<void> {
  const maren = await demoPerson('listener@roomwright.test')
  const felix = await demoPerson('felix.aduya@roomwright.test')
  const teodor = await demoPerson('advisor@roomwright.test')
  const priya = await demoPerson('priya.halvorsen@roomwright.test')

  const { Case, Room } = models()
  const sent = await Case.findAll({
    attributes: ['id', 'roomId', 'roomRevision', 'createdAt'], where: { listenerId: felix.id, status: 'plan_sent' },
    include: [{ association: 'plans', attributes: ['id'], required: false }], order: [['createdAt', 'ASC']],
  })
  const garden = sent.find((c) => !c.plans?.length)
  if (garden) {
    const room = (await findRoom(garden.roomId, garden.roomRevision))!.room
    const v = await createPlan(teodor, garden.id, demoPlanBody(room, 'Your room is already close to ideal. The **cloud** above the desk catches the ceiling reflection; the front-corner traps take the edge off the 60 Hz boom.\n\nHang the cloud only from fixings rated for its weight, and re-measure at the mix position afterwards.'))
    await sendPlan(teodor, garden.id, v.version, { fromStatus: 'plan_sent', message: 'Felix, here are the details I promised: the cloud first, then the corner traps.' })
  }

  // Maren's box-room studio: submitted, claimed by Priya, one question and answer, measurements, plan sent.
  if (await Room.count({ where: { ownerId: maren.id, name: demoRooms.smallStudio.name } })) return
  const { room, case: c } = await playCase({
    listener: maren.email, room: 'smallStudio',
    case: {
      title: 'My mixes sound thin everywhere else',
      description: 'Mixes made in the **box room** sound full here and thin in the car and on headphones. The monitors have rear ports and stand about 30 cm from the wall behind the desk.',
      answers: { use: 'Mixing my own songs', seat: 'The desk chair', bothers: 'Bass that does not translate', budget: '250-1000', constraints: 'Rented: freestanding treatment only' },
    },
    steps: [
      { by: maren.email, update: { status: 'submitted', fromStatus: 'draft' } },
      { by: priya.email, update: { assigneeId: 'self' } },
      { by: priya.email, update: { status: 'in_review', fromStatus: 'submitted' } },
      { by: priya.email, message: { body: 'Internal: first length and width modes at 52 and 61 Hz, both strong at the chair; rear ports 0.45 m from the front wall.', internal: true } },
      { by: priya.email, message: { body: 'Hello Maren, in a room this small the first bass modes pile up just where you sit, so the bass sounds fuller here than anywhere else. Could you measure each monitor on its own from the chair? Please keep the level moderate.', ask: true } },
    ],
  })
  const fileIds: string[] = []
  for (const [i, label] of ['L', 'R'].entries()) {
    const bytes = syntheticImpulseResponse(room.room, label, { seed: 2000 + i })
    const key = `incoming/${randomUUID()}.wav`
    await storage().put(key, Buffer.from(bytes))
    const file = await addCaseFile(maren, c.id, {
      key, size: bytes.length, originalname: `${label === 'L' ? 'left' : 'right'}-monitor-at-chair (synthetic demo).wav`,
      mime: 'audio/wav', mimetype: 'audio/wav', kind: 'measurement', format: 'wav', fieldname: 'file',
    })
    fileIds.push(file.id)
  }
  await postMessage(maren, c.id, { body: 'Here are both speakers measured from the chair, at a moderate level.', fileIds })
  const plan = await createPlan(priya, c.id, demoPlanBody(room.room, 'In a room this size the bass is set by the **corners** first. The traps stand on the floor, so nothing is fixed to the walls of your rented flat.\n\n1. Move the chair as marked.\n2. Put the two corner traps in the front corners.\n3. Hang the side panels at the marked points.\n\nRe-measure from the chair after each step.'))
  const current = (await Case.findByPk(c.id, { attributes: ['status'] }))!
  await sendPlan(priya, c.id, plan.version, { fromStatus: current.status as 'in_review', message: 'Maren, thanks for the measurements: they confirm the pile-up near 55 Hz. Here is the plan, in the order I would do it.' })
}
