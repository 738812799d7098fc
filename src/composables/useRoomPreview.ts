import { computed, onScopeDispose, ref, shallowRef, watch } from 'vue'
import { computeRoomAnalysis, firstReflections, type RoomAnalysis, type Surface } from '../../shared/acoustics'
import { engineLimitIssues, type Room } from '../../shared/schemas/room'

/** One speaker → seat pair's first-order reflection points, for the plan drawing. */
export interface PlanReflectionPair {
  speaker: string
  seat: string
  points: { surface: Surface; point: { x: number; y: number; z: number }; inWindow: boolean | null }[]
}

/**
 * The engine's analysis of a room description, recomputed in the browser a short while after each change
 * (the engine takes tens of milliseconds). `source` gives the current room, or null while the description
 * is invalid; the last good analysis then stays on screen, marked stale.
 * The plan's reflection points come from the engine at once, on every change, so dragging stays live.
 */
export function useRoomPreview(source: () => Room | null, opts: { delayMs?: number; units?: () => 'metric' | 'imperial' } = {}) {
  const delayMs = opts.delayMs ?? 100
  const analysis = shallowRef<RoomAnalysis | null>(null)
  const analysedRoom = shallowRef<Room | null>(null)
  const engineError = ref<string | null>(null)
  const pending = ref(false)
  const lastMs = ref<number | null>(null)
  let timer: ReturnType<typeof setTimeout> | undefined

  function compute(room: Room): void {
    const started = performance.now()
    try {
      // the same limits the server answers 422 for: beyond them the engine would hold the page for seconds
      const beyond = engineLimitIssues(room)
      if (beyond.length) {
        engineError.value = `This room is beyond what Roomwright analyses: ${beyond[0].message}`
        return
      }
      analysis.value = computeRoomAnalysis(room, { units: opts.units?.() ?? 'metric' })
      analysedRoom.value = room
      engineError.value = null
    } catch (error) {
      engineError.value = error instanceof Error ? error.message : String(error)
    } finally {
      pending.value = false
      lastMs.value = performance.now() - started
    }
  }

  watch(
    source,
    (room) => {
      clearTimeout(timer)
      if (!room) {
        pending.value = false
        return
      }
      pending.value = true
      timer = setTimeout(() => compute(room), analysis.value ? delayMs : 0)
    },
    { immediate: true },
  )

  onScopeDispose(() => clearTimeout(timer))

  const current = computed(() => source())
  /** The analysis no longer matches the description on screen. */
  const stale = computed(() => pending.value || current.value === null || engineError.value !== null)

  const planReflections = computed<PlanReflectionPair[]>(() => {
    const room = current.value
    if (!room) return []
    const fresh = !stale.value && analysis.value !== null
    const box = { length: room.length, width: room.width, height: room.height }
    const pairs: PlanReflectionPair[] = []
    for (const speaker of room.speakers) {
      for (const seat of room.seats) {
        let reflections
        try {
          reflections = firstReflections(box, speaker, seat, { celsius: room.celsius })
        } catch {
          continue
        }
        const analysed = fresh ? analysis.value!.reflections.find((p) => p.speaker === speaker.label && p.seat === seat.label) : undefined
        pairs.push({
          speaker: speaker.label,
          seat: seat.label,
          points: reflections.map((r) => ({
            surface: r.surface,
            point: r.point,
            inWindow: analysed?.first.find((f) => f.surface === r.surface)?.inWindow ?? null,
          })),
        })
      }
    }
    return pairs
  })

  return { analysis, analysedRoom, engineError, pending, stale, lastMs, planReflections }
}
