import type { DemoRoomKey } from './rooms'

/**
 * Invented stories for the demo history: what kind of room, what its owner hears, how the advisor
 * answers, what the advisor asks and what comes back, and how it ends. Each story's texts are written
 * for its room, so a cinema case talks about the subwoofer and a box-room studio about the desk.
 */
export interface DemoStory {
  shape: DemoRoomKey
  roomNames: readonly string[]
  titles: readonly string[]
  descriptions: readonly string[]
  answers: { use: string; seat: string; bothers: string; budget: 'under-250' | '250-1000' | '1000-3000' | 'over-3000' | 'not-sure'; constraints: string }
  /** the advisor's first answer */
  firstReplies: readonly string[]
  /** a question the advisor asks, and the listener's answer (no files are claimed: the history has none) */
  asks: readonly { ask: string; answer: string }[]
  /** the words sent with the plan */
  planMessages: readonly string[]
  /** the listener's comment with a good (4–5) and a mixed (1–3) rating */
  good: readonly string[]
  mixed: readonly string[]
  /** the advisor's plan notes (markdown) */
  planNotes: string
  /** how far the seat and speakers may be moved for variants, metres */
  wiggle: number
}

export const demoStories: readonly DemoStory[] = [
  {
    shape: 'smallStudio',
    roomNames: ['Box-room studio', 'Spare-room studio', 'Bedroom studio', 'Home office studio'],
    titles: ['Mixes come out bass-light', 'Monitors sound boomy at the desk', 'Kick drum vanishes at the chair', 'Tiny room, big bass problems'],
    descriptions: [
      'My mixes sound fine here but thin everywhere else. The room is small and the monitors have rear ports about 30 cm from the wall.',
      'At the desk one bass note jumps out and the next one is gone. Leaning back half a metre changes everything.',
    ],
    answers: { use: 'Mixing electronic music and podcasts', seat: 'The desk chair', bothers: 'Uneven bass, mixes do not translate', budget: '250-1000', constraints: 'Rented flat: nothing glued to the walls' },
    firstReplies: [
      'In a room this small the first length and width modes sit close together below 70 Hz; that is the bump you hear. Corner traps come first here.',
      'The rear ports are close to the front wall, which lifts the upper bass. Moving the monitors 15 cm forward is the free first step.',
    ],
    asks: [
      { ask: 'Could the desk come 20–30 cm away from the front wall, or is the window in the way?', answer: 'The desk can come forward about 25 cm; the window sill is behind it.' },
      { ask: 'Are the monitors on stands or on the desk itself?', answer: 'On foam pads on the desk. Stands would fit beside it.' },
    ],
    planMessages: ['Freestanding corner traps first (no screws needed), then the two side panels.', 'Start with the monitor positions, then the front corners.'],
    good: ['Mixes finally translate to the car.', 'The corner traps made the biggest difference.', 'Clear, practical steps for a rented room.'],
    mixed: ['Helpful, but I cannot fit all the traps.', 'The bass is better, the desk reflection is still there.'],
    planNotes: 'In a room this size the bass is set by the **corners** first. The traps stand on the floor; nothing is fixed to the walls.\n\nRe-measure at the chair after each step.',
    wiggle: 0.1,
  },
  {
    shape: 'sofaLiving',
    roomNames: ['Living room', 'Front room', 'Lounge', 'Sitting room'],
    titles: ['Boomy bass at the sofa', 'Bass is muddy from the sofa, clean in the middle of the room', 'Voices sound boxy on the sofa', 'Sofa against the wall: too much bass'],
    descriptions: [
      'The sofa is pushed against the back wall. There the bass is heavy and slow; standing in the middle of the room it is much cleaner.',
      'Music sounds thick and boxy from the sofa. We cannot move the sofa far, but perhaps a little.',
    ],
    answers: { use: 'Vinyl, jazz and films', seat: 'The middle of the sofa', bothers: 'Heavy, slow bass at the sofa', budget: '250-1000', constraints: 'Family room: it has to look tidy' },
    firstReplies: [
      'With the seat against the back wall every length mode has its pressure peak at your head; that is the heavy bass. Even 40 cm forward helps.',
      'The back wall is right behind your ears, so its reflection arrives almost at once and colours voices. A panel behind the sofa takes care of it.',
    ],
    asks: [
      { ask: 'Could the sofa come forward from the back wall, even by 30–50 cm?', answer: 'About 40 cm is possible if we move the side table.' },
      { ask: 'Is there a rug between the speakers and the sofa?', answer: 'Only a small one, about 1.2 by 1.8 m.' },
    ],
    planMessages: ['Move the sofa first (free), then the panel behind it.', 'The panel behind the sofa and the rug do most of the work here.'],
    good: ['Moving the sofa 40 cm did more than I believed.', 'Tidy panels, and the bass is so much cleaner.', 'Exactly what I needed.'],
    mixed: ['We could not move the sofa, so the gain was small.', 'Good advice, slow first reply.'],
    planNotes: 'A seat against the back wall sits at the pressure peak of every length mode. **Bring the sofa forward** if you can, then absorb the wall behind it.',
    wiggle: 0.08,
  },
  {
    shape: 'cinema',
    roomNames: ['Home cinema', 'Cinema room', 'Basement theatre', 'Media room'],
    titles: ['Subwoofer booms in the front row', 'Back row has no bass', 'Dialogue is unclear in the cinema', 'Subwoofer placement in a dedicated cinema'],
    descriptions: [
      'The subwoofer stands beside the screen. The front row gets a huge boom around 45 Hz, the back row on the riser gets almost nothing.',
      'Explosions are impressive, voices are not: dialogue gets lost when the score is loud.',
    ],
    answers: { use: 'Films and concerts', seat: 'Front row, centre', bothers: 'Uneven bass between the rows', budget: '1000-3000', constraints: 'The screen wall is finished; the back wall is free' },
    firstReplies: [
      'The two rows sit near a peak and a null of the same width mode, which explains front-row boom and back-row silence. A second subwoofer evens this out.',
      'With the subwoofer in one spot the rows cannot both be right; we will look at its position and at traps in the back corners.',
    ],
    asks: [
      { ask: 'Is there a power socket on the back wall, for a second subwoofer?', answer: 'Yes, one in each back corner.' },
      { ask: 'How high is the riser for the back row?', answer: 'About 30 cm.' },
    ],
    planMessages: ['A second subwoofer on the back wall first, then the corner traps.', 'Traps in the back corners and panels at the side-wall reflection points.'],
    good: ['Both rows have bass now.', 'Dialogue is clear even at night levels.', 'Thorough plan, clear order of steps.'],
    mixed: ['The second subwoofer was over our budget.', 'Good plan, but it took a while.'],
    planNotes: 'Bass at two rows is a matter of **subwoofer position** first and absorption second. Please keep test levels moderate; the cinema is loud.',
    wiggle: 0.12,
  },
  {
    shape: 'atticSloped',
    roomNames: ['Attic room', 'Loft den', 'Room under the roof', 'Attic listening room'],
    titles: ['Harsh treble under the sloped ceiling', 'Attic room sounds boxy', 'Vocals smear in the attic', 'Flutter between the sloped walls'],
    descriptions: [
      'The ceiling slopes down on both sides. Treble sounds hard and vocals seem to come from the ceiling rather than the speakers.',
      'Clapping gives a metallic ring between the slopes. The room is otherwise quiet and pleasant.',
    ],
    answers: { use: 'Acoustic music and audiobooks', seat: 'The reading chair', bothers: 'Hard treble and a ring when I clap', budget: 'under-250', constraints: 'Sloped ceiling: nothing heavy overhead' },
    firstReplies: [
      'The sloped ceiling sends the first reflection straight to your head. Light panels on the slopes at the reflection points are the first step.',
      'A metallic ring when clapping is flutter between parallel hard surfaces; here the lower parts of the slopes.',
    ],
    asks: [
      { ask: 'How far from the floor does the slope start on each side?', answer: 'At about 1.1 m on both sides.' },
      { ask: 'Are the slopes plasterboard on rafters?', answer: 'Yes, plasterboard with insulation behind.' },
    ],
    planMessages: ['Light panels on the slopes (use fixings rated for the load), then a rug.', 'Start with the rug, then the two slope panels.'],
    good: ['The ring is gone and voices sit between the speakers.', 'Cheap and effective.', 'Quick, kind and clear.'],
    mixed: ['I was hoping for more than two panels.', 'Fine, although fixing to the slope was harder than I thought.'],
    planNotes: 'The slopes are the first reflection here. Keep panels light and use fixings rated for their weight; **nothing heavy overhead**.',
    wiggle: 0.1,
  },
  {
    shape: 'longWall',
    roomNames: ['Study', 'Narrow study', 'Garden office', 'Library'],
    titles: ['Stereo image leans left', 'Flutter echo when I clap', 'Hollow sound in the centre', 'Speakers on the long wall: is it right?'],
    descriptions: [
      'The desk faces the long wall because of the door. The centre image is vague and the bare side walls slap when I clap.',
      'Voices lean towards the left speaker, even after checking the balance.',
    ],
    answers: { use: 'Listening while working, some editing', seat: 'The desk chair', bothers: 'Vague centre image', budget: 'under-250', constraints: 'The door position is fixed' },
    firstReplies: [
      'Facing the long wall is a sound choice in a narrow room. The side walls are close, so their first reflections arrive early; panels there come first.',
      'The door on one side changes the left reflection only; that alone can pull the image. Matching the two sides is the first step.',
    ],
    asks: [{ ask: 'Is the door usually open or closed when you listen?', answer: 'Closed, usually.' }],
    planMessages: ['Side-wall panels first, then the wall behind you.', 'Matching the two sides first; the rest follows.'],
    good: ['The centre is back.', 'The slap echo is gone.', 'Clear explanation of why.'],
    mixed: ['Better, though the door side still sounds different.', 'Slow first reply.'],
    planNotes: 'Close side walls give early, strong reflections. Treat both sides **alike**, so the image stays centred.',
    wiggle: 0.08,
  },
  {
    shape: 'square',
    roomNames: ['Living room', 'Music room', 'Square front room'],
    titles: ['One bass note rings on', 'Some bass notes vanish', 'Bass changes from seat to seat'],
    descriptions: ['The room is nearly square. Some bass notes are huge and others almost disappear.', 'A single low note keeps ringing after the music stops.'],
    answers: { use: 'Classical and jazz', seat: 'The sofa', bothers: 'Uneven bass', budget: '1000-3000', constraints: 'Panels must look tidy' },
    firstReplies: [
      'In a nearly square room the length and width modes land on the same frequencies and reinforce each other; that is the ringing note.',
      'The seat is close to the middle of the room, where several modes have a null: that is where the notes vanish.',
    ],
    asks: [{ ask: 'Could the sofa move towards the back, to about 60 % of the length?', answer: 'Yes, it fits there.' }],
    planMessages: ['Seat position first, then the corner traps.', 'Corner traps first: the room needs them.'],
    good: ['The ringing note is tamed.', 'The bass traps made a real difference.'],
    mixed: ['Only a little better; the room shape is the room shape.', 'Would have liked more detail on fixings.'],
    planNotes: 'A near-square plan stacks modes. Move the seat off the centre first, then trap the corners.',
    wiggle: 0.15,
  },
  {
    shape: 'good',
    roomNames: ['Garden studio', 'Converted barn', 'Studio cabin'],
    titles: ['Fine-tuning a good room', 'Is a ceiling cloud worth it?', 'Last details before mastering'],
    descriptions: ['The room already sounds good. I want to know whether a cloud above the desk would help.', 'Everything is close; I am after the last few dB of evenness.'],
    answers: { use: 'Mixing and mastering', seat: 'The mix position', bothers: 'A slight boom near 60 Hz', budget: 'over-3000', constraints: '' },
    firstReplies: ['The layout is close to ideal. What is left is the ceiling reflection and a mild 60 Hz mode.', 'Very little to fix here; a cloud and deeper front-corner traps are the next steps.'],
    asks: [{ ask: 'What is above the ceiling: a loft or the roof itself?', answer: 'The roof, with 150 mm of insulation.' }],
    planMessages: ['A cloud above the desk, rated fixings, then re-measure.', 'Deeper corner traps and the cloud.'],
    good: ['Small changes, clearly audible.', 'Exactly what I needed.'],
    mixed: ['Not much to gain, as expected.'],
    planNotes: 'Hang the cloud only from fixings rated for its weight. Re-measure at the mix position afterwards.',
    wiggle: 0.1,
  },
]
