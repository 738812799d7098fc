import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { Room, RoomRecord, RoomSummary } from '../../shared/schemas/room'
import * as roomsApi from '../api/rooms'

const summaryOf = (record: RoomRecord): RoomSummary => ({
  id: record.id,
  name: record.room.name,
  revision: record.revision,
  length: record.room.length,
  width: record.room.width,
  height: record.room.height,
  updatedAt: record.updatedAt,
})

/** The listener's rooms: the list, and the records opened in the editor. */
export const useRoomsStore = defineStore('rooms', () => {
  const summaries = ref<RoomSummary[]>([])
  const listLoaded = ref(false)

  /** GET /api/rooms; the list stays as it was when the request fails (the caller shows the error). */
  async function loadList(): Promise<RoomSummary[]> {
    summaries.value = await roomsApi.listRooms()
    listLoaded.value = true
    return summaries.value
  }

  function remember(record: RoomRecord): void {
    const summary = summaryOf(record)
    const index = summaries.value.findIndex((room) => room.id === record.id)
    if (index === -1) summaries.value = [summary, ...summaries.value]
    else if (summaries.value[index]!.revision <= record.revision) summaries.value.splice(index, 1, summary)
  }

  /** One room at its latest revision, or an older one (read-only in the editor). */
  async function fetchRoom(id: string, revision?: number): Promise<RoomRecord> {
    const record = await roomsApi.getRoom(id, revision)
    if (revision === undefined) remember(record)
    return record
  }

  /** POST for a new room, PUT (a new revision) for an existing one. */
  async function saveRoom(room: Room, id?: string): Promise<RoomRecord> {
    const record = id ? await roomsApi.saveRoom(id, room) : await roomsApi.createRoom(room)
    remember(record)
    return record
  }

  return { summaries, listLoaded, loadList, fetchRoom, saveRoom }
})
