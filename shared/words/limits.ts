/** What a signed-in person did too often in a short time (server/middleware/user-rate-limit.ts). */
export type LimitedAction = 'messages' | 'uploads' | 'previews' | 'subwoofers' | 'search' | 'room-saves' | 'reports'

const DONE: Record<LimitedAction, string> = {
  messages: 'posted a lot of messages',
  uploads: 'added a lot of files',
  previews: 'asked for a lot of previews',
  subwoofers: 'started a lot of subwoofer searches',
  search: 'searched the queue a lot',
  'room-saves': 'saved rooms a lot of times',
  reports: 'made a lot of plan reports',
}

/** "about a minute", "about 4 minutes": how long to wait, from a Retry-After in seconds. */
export function waitWords(seconds: number): string {
  const minutes = Math.max(1, Math.ceil(seconds / 60))
  return minutes === 1 ? 'about a minute' : `about ${minutes} minutes`
}

/** The answer to a request past a per-person limit: what happened and how long to wait, in the second person. */
export function tooManyWords(action: LimitedAction, retryAfterSeconds: number): string {
  return `You have ${DONE[action]} in a short time. Please wait ${waitWords(retryAfterSeconds)}, then try again; what you did so far is kept.`
}
