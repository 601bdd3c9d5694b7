import { ref } from 'vue'
import type { StarterKey } from '../../shared/room-doc/starters'
import { defineStore } from 'pinia'
import * as api from '../api/http'
import { listActivity, roomActivity, watchRooms, type RoomActivity } from '../api/activity'
import type { RoomDetail, RoomSummary } from '../api/http'

function summaryOf(room: RoomDetail): RoomSummary {
  const { createdAt: _createdAt, ...summary } = room
  return summary
}

export const useRoomsStore = defineStore('rooms', () => {
  const rooms = ref<RoomSummary[]>([])
  const loading = ref(false)
  /** Per room: last change, open pins, settle state, people now, picture (issue 16). */
  const activity = ref<Record<string, RoomActivity>>({})

  /** Fetch the rooms I belong to, replacing the list shown. */
  async function list(): Promise<RoomSummary[]> {
    loading.value = true
    try {
      rooms.value = await api.listRooms()
      return rooms.value
    } finally {
      loading.value = false
    }
  }

  /** Create a room (I become its owner) from a starting frame and put it at the top of the list. */
  async function create(name: string, description: string, starter?: StarterKey): Promise<RoomDetail> {
    const room = await api.createRoom({
      name: name.trim(),
      description: description.trim(),
      ...(starter ? { starter } : {}),
    })
    rooms.value = [summaryOf(room), ...rooms.value.filter((r) => r.id !== room.id)]
    return room
  }

  /** Rename a room (owner or editor) and update it in the list. */
  async function rename(id: string, name: string): Promise<RoomDetail> {
    const room = await api.updateRoom(id, { name: name.trim() })
    rooms.value = rooms.value.map((r) => (r.id === id ? summaryOf(room) : r))
    return room
  }

  /** Delete a room (owner only) and drop it from the list. */
  async function remove(id: string): Promise<void> {
    await api.deleteRoom(id)
    rooms.value = rooms.value.filter((r) => r.id !== id)
  }

  /** Fetch every room's activity for the list. */
  async function loadActivity(): Promise<void> {
    activity.value = await listActivity()
  }

  /** Keeps the list current while it is open: each changed room is fetched again. Returns the stop. */
  function watch(): () => void {
    return watchRooms((roomId) => {
      void (async () => {
        if (!rooms.value.some((r) => r.id === roomId)) await list()
        activity.value = { ...activity.value, [roomId]: await roomActivity(roomId) }
      })().catch(() => undefined) // a room just left or deleted: the next full load drops it
    })
  }

  /** Forget every room, e.g. after signing out, so the next user never sees them. */
  function clear(): void {
    rooms.value = []
    activity.value = {}
  }

  return { rooms, loading, activity, list, loadActivity, watch, create, rename, remove, clear }
})
