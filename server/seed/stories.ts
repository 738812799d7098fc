import { demoRooms, type DemoRoomKey } from './rooms'
import stories from './data/stories.json'

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

/** The stories themselves are the table in data/stories.json; each is checked here when this module loads. */
export const demoStories = stories as readonly DemoStory[]
const budgets = new Set(['under-250', '250-1000', '1000-3000', 'over-3000', 'not-sure'])
for (const story of demoStories) {
  if (!(story.shape in demoRooms)) throw new Error(`demo story for an unknown room shape: ${story.shape}`)
  if (!budgets.has(story.answers.budget)) throw new Error(`demo story ${story.shape}: unknown budget ${story.answers.budget}`)
  if (!story.titles.length || !story.descriptions.length || !story.firstReplies.length || !story.planMessages.length) throw new Error(`demo story ${story.shape}: a list is empty`)
}
