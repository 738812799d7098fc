import { computed, onBeforeUnmount, onMounted, watch, type Ref } from 'vue'
import { useCasesStore } from '../stores/cases'
import { useLiveStore } from '../stores/live'

/** Calls `fn` once after `ms` of quiet, however often it was asked for meanwhile. */
export function debounce(fn: () => void, ms: number): { (): void; cancel(): void } {
  let timer: ReturnType<typeof setTimeout> | null = null
  const run = () => {
    if (timer) clearTimeout(timer)
    timer = setTimeout(() => {
      timer = null
      fn()
    }, ms)
  }
  run.cancel = () => {
    if (timer) clearTimeout(timer)
    timer = null
  }
  return run
}

/**
 * Keeps the open case (cases store) live while the page shows it: joins its socket room, reloads
 * what each event touched, catches up from the database after a reconnect, and shows who else is
 * on the case. Announces this viewer every minute so presence does not go stale.
 */
export function useCaseLive(caseId: Ref<string>) {
  const live = useLiveStore()
  const cases = useCasesStore()
  const offs: (() => void)[] = []
  let heartbeat: ReturnType<typeof setInterval> | null = null
  let typingSince = 0
  let typingTimer: ReturnType<typeof setTimeout> | null = null

  const mine = (payload: { caseId: string }) => payload.caseId === caseId.value
  const syncSoon = debounce(() => void cases.syncEvents(), 150)
  const messagesSoon = debounce(() => void cases.refreshMessages(), 150)
  const detailSoon = debounce(() => void cases.refreshDetail(), 150)
  const filesSoon = debounce(() => void cases.refreshFiles(), 150)

  function start(id: string) {
    void live.joinCase(id, cases.lastSeq)
  }

  onMounted(() => {
    offs.push(
      live.on('case.event', (e) => mine(e) && syncSoon()),
      live.on('case.message', (e) => mine(e) && messagesSoon()),
      live.on('case.updated', (e) => mine(e) && detailSoon()),
      live.on('case.analysis', (e) => mine(e) && filesSoon()),
      live.on('case.caught-up', (e) => mine(e) && void cases.catchUp()),
    )
    start(caseId.value)
    heartbeat = setInterval(() => live.setTyping(caseId.value, false), 60_000)
  })

  watch(caseId, (id, old) => {
    if (old) live.leaveCase(old)
    if (id) start(id)
  })

  watch(
    () => cases.lastSeq,
    (seq) => {
      if (seq !== undefined) live.sawSeq(caseId.value, seq)
    },
  )

  onBeforeUnmount(() => {
    for (const off of offs) off()
    for (const pending of [syncSoon, messagesSoon, detailSoon, filesSoon]) pending.cancel()
    if (heartbeat) clearInterval(heartbeat)
    if (typingTimer) clearTimeout(typingTimer)
    live.setTyping(caseId.value, false)
    live.leaveCase(caseId.value)
  })

  /** Call on every keystroke in the composer: tells others "typing", and "viewing" again after a pause. */
  function typed(): void {
    const now = Date.now()
    if (now - typingSince > 3000) {
      typingSince = now
      live.setTyping(caseId.value, true)
    }
    if (typingTimer) clearTimeout(typingTimer)
    typingTimer = setTimeout(() => {
      typingSince = 0
      live.setTyping(caseId.value, false)
    }, 4000)
  }

  /** The message went out: no longer typing. */
  function stoppedTyping(): void {
    if (typingTimer) clearTimeout(typingTimer)
    typingSince = 0
    live.setTyping(caseId.value, false)
  }

  const presence = computed(() => live.presenceFor(caseId.value))

  return { presence, online: computed(() => live.online), connection: computed(() => live.state), typed, stoppedTyping }
}

/** Runs `refresh` (debounced) whenever any case in the queue changes. */
export function useQueueLive(refresh: () => void, ms = 800) {
  const live = useLiveStore()
  const soon = debounce(refresh, ms)
  let off: (() => void) | null = null
  onMounted(() => {
    live.connect()
    off = live.on('queue.changed', () => soon())
  })
  onBeforeUnmount(() => {
    off?.()
    soon.cancel()
  })
  return { online: computed(() => live.online), connection: computed(() => live.state) }
}
