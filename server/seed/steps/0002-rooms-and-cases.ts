import { findUserByEmail, toPublicUser } from '../../data/users'
import { createRoom } from '../../services/rooms'
import { createCase, updateCase } from '../../services/cases'
import { postMessage } from '../../services/messages'
import { roomSchema } from '../../../shared/schemas/room'
import { demoRooms } from '../rooms'

async function person(email: string) {
  const u = await findUserByEmail(email)
  if (!u) throw new Error(`demo person ${email} is missing`)
  return toPublicUser(u)
}

/** Demo rooms and cases across the lifecycle, written through the same services people use. */
export async function seed(): Promise<void> {
  const maren = await person('listener@roomwright.test')
  const jonas = await person('jonas.mbeki@roomwright.test')
  const clara = await person('clara.vasquez-ito@roomwright.test')
  const felix = await person('felix.aduya@roomwright.test')
  const teodor = await person('advisor@roomwright.test')
  const priya = await person('priya.halvorsen@roomwright.test')

  const room = async (owner: typeof maren, key: keyof typeof demoRooms) => createRoom(owner, roomSchema.parse(demoRooms[key]))

  // Maren: the near-square living room, just sent in.
  const r1 = await room(maren, 'square')
  const c1 = await createCase(maren, {
    roomId: r1.id, title: 'One bass note booms, the next one vanishes',
    description: 'Playing a bass line, some notes are huge at the sofa and others almost disappear. Vocals sound fine. The room is nearly square and I suspect that matters.',
    answers: { use: 'Mostly jazz, acoustic bass and piano', seat: 'Middle of the sofa', bothers: 'Uneven bass', budget: '250-1000', constraints: 'Shared living room: panels must look tidy' },
  })
  await updateCase(maren, c1.id, { status: 'submitted', fromStatus: 'draft' })
  // Maren's second room is still a draft.
  const r5 = await room(maren, 'attic')
  await createCase(maren, { roomId: r5.id, title: 'Attic room for the open baffles', description: 'Not finished describing yet.' })

  // Jonas: speakers on the long wall, in review with Teodor.
  const r2 = await room(jonas, 'longWall')
  const c2 = await createCase(jonas, {
    roomId: r2.id, title: 'Stereo image is wide but hollow in the middle',
    description: 'The desk faces the long wall because of the door. The centre image is vague and there is a hard slap when I clap.',
    answers: { use: 'Home studio: mixing podcasts and some electronic music', seat: 'The desk chair', bothers: 'Phantom centre and a slap echo', budget: 'under-250', constraints: 'The door position is fixed' },
  })
  await updateCase(jonas, c2.id, { status: 'submitted', fromStatus: 'draft' })
  await updateCase(teodor, c2.id, { status: 'in_review', fromStatus: 'submitted' })
  await postMessage(teodor, c2.id, { body: 'Internal: side walls are only 0.45 m behind the speakers; the front-wall notch lands near 190 Hz.', internal: true })
  await postMessage(teodor, c2.id, { body: 'Hi Jonas, thanks for the clear description. Facing the long wall is not a bad choice in a narrow room. The slap is most likely between the bare side walls; I will come back with panel positions today.' })

  // Clara: the asymmetric basement cinema, waiting on her.
  const r3 = await room(clara, 'asymmetric')
  const c3 = await createCase(clara, {
    roomId: r3.id, title: 'Dialogue pulls to the left in the basement cinema',
    description: 'Voices seem to come from the left speaker. The subwoofer is in the corner and the bass is strong at the recliner but weak in the second row.',
    answers: { use: 'Films and series', seat: 'The recliner', bothers: 'Off-centre dialogue, uneven bass between rows', budget: '1000-3000', constraints: 'The stairs open on the right side' },
  })
  await updateCase(clara, c3.id, { status: 'submitted', fromStatus: 'draft' })
  await updateCase(priya, c3.id, { status: 'in_review', fromStatus: 'submitted' })
  await postMessage(priya, c3.id, { body: 'Hello Clara, could you measure each front speaker on its own from the recliner (left, then right) and upload both files? Please keep the level moderate.', ask: true })

  // Felix: the well set-up garden studio, plan sent.
  const r4 = await room(felix, 'good')
  const c4 = await createCase(felix, {
    roomId: r4.id, title: 'Fine-tuning a garden studio',
    description: 'The room already sounds good. I want to know whether ceiling treatment above the desk would help, and what to do about the slight boom near 60 Hz.',
    answers: { use: 'Mixing and mastering', seat: 'The mix position', bothers: 'Slight boom near 60 Hz', budget: 'over-3000', constraints: '' },
  })
  await updateCase(felix, c4.id, { status: 'submitted', fromStatus: 'draft' })
  await updateCase(teodor, c4.id, { status: 'in_review', fromStatus: 'submitted' })
  await postMessage(teodor, c4.id, { body: 'Felix, the layout is close to ideal. A cloud above the desk and deep traps in the front corners are the next steps; details follow in the plan.' })
  await updateCase(teodor, c4.id, { status: 'plan_sent', fromStatus: 'in_review' })
}
