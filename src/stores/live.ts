import { defineStore } from 'pinia'
import { io, type Socket } from 'socket.io-client'
import { computed, reactive, ref, watch } from 'vue'
import type { CaseEvent } from '../../shared/schemas/case'
import type { Role } from '../../shared/schemas/auth'
import { useAuthStore } from './auth'
import { forgetEarly } from '../api/client'

export interface LiveEvents {
  'case.event': { caseId: string; seq: number; kind: string }
  'case.message': { caseId: string; messageId: string; internal: boolean }
  'case.updated': { caseId: string }
  'case.analysis': { caseId: string; fileId: string; status: string }
  'queue.changed': { caseId: string }
  presence: PresenceSignal
  /** after a reconnect, once per joined case: the events missed meanwhile, from the database */
  'case.caught-up': { caseId: string; missed: (CaseEvent & { seq: number })[] }
}
export type LiveEventName = keyof LiveEvents

export interface PresenceSignal {
  caseId: string
  userId: string
  name: string
  role: Role
  state: 'viewing' | 'typing'
}

export interface Presence extends PresenceSignal {
  /** ms since epoch of the last signal; entries expire when their owner goes quiet */
  at: number
}

/** A viewer who sends nothing for this long has probably left (the page re-announces itself every minute). */
const PRESENCE_TTL_MS = 150_000
/** "typing" falls back to "viewing" when no new keystroke signal arrives. */
const TYPING_TTL_MS = 8_000

type Handler<E extends LiveEventName> = (payload: LiveEvents[E]) => void
type JoinAck = { ok: true; missed?: (CaseEvent & { seq: number })[] } | { ok: false; error: { code: string; message: string } }

/**
 * The one socket.io connection of this tab: signed in by the session cookie, joined to the cases on
 * screen, re-joined with the last seen event after a reconnect so nothing missed is lost.
 */
export const useLiveStore = defineStore('live', () => {
  const auth = useAuthStore()
  const state = ref<'off' | 'connecting' | 'online' | 'offline'>('off')
  let socket: Socket | null = null
  let everConnected = false
  const handlers = new Map<LiveEventName, Set<(payload: never) => void>>()
  /** joined case → the last event seq this tab has seen */
  const joined = new Map<string, number | undefined>()
  const presenceByCase = reactive(new Map<string, Map<string, Presence>>())
  const now = ref(Date.now())
  let clock: ReturnType<typeof setInterval> | null = null

  function emitLocal<E extends LiveEventName>(name: E, payload: LiveEvents[E]): void {
    for (const handler of handlers.get(name) ?? []) (handler as Handler<E>)(payload)
  }

  /** Listen to a live event; returns the function that stops listening. */
  function on<E extends LiveEventName>(name: E, handler: Handler<E>): () => void {
    let set = handlers.get(name)
    if (!set) handlers.set(name, (set = new Set()))
    set.add(handler as (payload: never) => void)
    return () => set!.delete(handler as (payload: never) => void)
  }

  function join(caseId: string, afterSeq: number | undefined): Promise<(CaseEvent & { seq: number })[]> {
    return new Promise((resolve) => {
      if (!socket?.connected) return resolve([])
      socket.timeout(8000).emit('case.join', { caseId, afterSeq }, (err: Error | null, ack: JoinAck) => {
        resolve(!err && ack?.ok ? (ack.missed ?? []) : [])
      })
    })
  }

  function connect(): void {
    if (socket || !auth.user) return
    state.value = 'connecting'
    socket = io({ withCredentials: true, transports: ['websocket', 'polling'] })
    socket.on('connect', async () => {
      state.value = 'online'
      const again = everConnected
      everConnected = true
      for (const [caseId, lastSeq] of joined) {
        const missed = await join(caseId, again ? lastSeq : undefined)
        if (again) emitLocal('case.caught-up', { caseId, missed })
      }
    })
    socket.on('disconnect', () => {
      state.value = 'offline'
    })
    socket.on('connect_error', () => {
      state.value = 'offline'
    })
    for (const name of ['case.event', 'case.message', 'case.updated', 'case.analysis', 'queue.changed'] as const) {
      socket.on(name, (payload: LiveEvents[typeof name]) => {
        // something changed on the server: an answer asked for early may predate it, so none is taken
        forgetEarly()
        if (name === 'case.event' && joined.has(payload.caseId)) {
          const seq = (payload as LiveEvents['case.event']).seq
          const last = joined.get(payload.caseId)
          if (last === undefined || seq > last) joined.set(payload.caseId, seq)
        }
        emitLocal(name, payload as never)
      })
    }
    socket.on('presence', (signal: PresenceSignal) => {
      if (signal.userId === auth.user?.id) return
      let map = presenceByCase.get(signal.caseId)
      if (!map) presenceByCase.set(signal.caseId, (map = new Map()))
      map.set(signal.userId, { ...signal, at: Date.now() })
      emitLocal('presence', signal)
    })
    clock = setInterval(() => {
      now.value = Date.now()
    }, 4000)
  }

  function disconnect(): void {
    socket?.disconnect()
    socket = null
    everConnected = false
    joined.clear()
    presenceByCase.clear()
    if (clock) clearInterval(clock)
    clock = null
    state.value = 'off'
  }

  /** Join a case's live room; resolves to nothing missed on a first join (the page has just loaded). */
  async function joinCase(caseId: string, lastSeq?: number): Promise<void> {
    connect()
    joined.set(caseId, lastSeq)
    await join(caseId, undefined)
  }

  /** The page has seen events up to this seq (from its own GET). */
  function sawSeq(caseId: string, seq: number): void {
    if (!joined.has(caseId)) return
    const last = joined.get(caseId)
    if (last === undefined || seq > last) joined.set(caseId, seq)
  }

  function leaveCase(caseId: string): void {
    joined.delete(caseId)
    presenceByCase.delete(caseId)
    socket?.emit('case.leave', { caseId })
  }

  function setTyping(caseId: string, typing: boolean): void {
    if (socket?.connected && joined.has(caseId)) socket.emit('case.typing', { caseId, typing })
  }

  /** Who else is on this case now: typing first, then viewing; stale entries left out. */
  function presenceFor(caseId: string): Presence[] {
    const map = presenceByCase.get(caseId)
    if (!map) return []
    const t = now.value
    return [...map.values()]
      .filter((p) => t - p.at < PRESENCE_TTL_MS)
      .map((p) => (p.state === 'typing' && t - p.at > TYPING_TTL_MS ? { ...p, state: 'viewing' as const } : p))
      .sort((a, b) => (a.state === b.state ? a.name.localeCompare(b.name) : a.state === 'typing' ? -1 : 1))
  }

  watch(
    () => auth.user?.id,
    (id) => {
      if (!id) disconnect()
    },
  )

  const online = computed(() => state.value === 'online')

  return { state, online, on, connect, disconnect, joinCase, leaveCase, sawSeq, setTyping, presenceFor }
})
