import { ref, watch, type Ref } from 'vue'
import { ApiError, getRoom, listMembers, type Member, type RoomDetail } from '../api/http'

/**
 * Loads one room and its members for the room page, again whenever the route's id changes.
 * `missing` is set for 404 (no such room, or I am not a member: the server does not tell which).
 */
export function useRoomPage(id: Ref<string>) {
  const room = ref<RoomDetail | null>(null)
  const members = ref<Member[]>([])
  const loading = ref(false)
  const missing = ref(false)
  const error = ref<string | null>(null)
  let generation = 0

  async function load(): Promise<void> {
    const mine = ++generation
    loading.value = true
    missing.value = false
    error.value = null
    try {
      const [r, m] = await Promise.all([getRoom(id.value), listMembers(id.value)])
      // A slower reply for a room we already left must not overwrite the current one.
      if (mine !== generation) return
      room.value = r
      members.value = m
    } catch (err) {
      if (mine !== generation) return
      room.value = null
      members.value = []
      if (err instanceof ApiError && err.status === 404) missing.value = true
      else error.value = (err as Error).message
    } finally {
      if (mine === generation) loading.value = false
    }
  }

  watch(id, load, { immediate: true })
  return { room, members, loading, missing, error, reload: load }
}
