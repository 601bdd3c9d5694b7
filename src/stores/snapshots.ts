import { ref } from 'vue'
import { defineStore } from 'pinia'
import * as team from '../api/team'
import type { SnapshotDetail, SnapshotSummary } from '../api/team'
import type { SurfaceMesh } from '../../shared/protocol'

export const useSnapshotsStore = defineStore('snapshots', () => {
  const roomId = ref<string | null>(null)
  const snapshots = ref<SnapshotSummary[]>([])
  const loading = ref(false)
  // Saved snapshots never change, so their details and meshes are kept once fetched.
  const details = new Map<string, Promise<SnapshotDetail>>()
  const surfaces = new Map<string, Promise<SurfaceMesh>>()

  function room(): string {
    if (!roomId.value) throw new Error('snapshots store: load(roomId) first')
    return roomId.value
  }

  /** Lists a room's snapshots. */
  async function load(id: string): Promise<void> {
    if (roomId.value !== id) {
      snapshots.value = []
      details.clear()
      surfaces.clear()
    }
    roomId.value = id
    loading.value = true
    try {
      const list = await team.listSnapshots(id)
      if (roomId.value === id) snapshots.value = list
    } finally {
      loading.value = false
    }
  }

  /** Saves the room's current frame, surface and figures (editor and up). */
  async function save(name: string, note: string): Promise<SnapshotSummary> {
    const s = await team.saveSnapshot(room(), { name: name.trim(), note: note.trim() })
    snapshots.value = [s, ...snapshots.value.filter((x) => x.id !== s.id)]
    return s
  }

  /** Deletes a snapshot (editor and up). */
  async function remove(sid: string): Promise<void> {
    await team.deleteSnapshot(room(), sid)
    snapshots.value = snapshots.value.filter((s) => s.id !== sid)
    details.delete(sid)
    surfaces.delete(sid)
  }

  function cached<T>(map: Map<string, Promise<T>>, sid: string, fetch: () => Promise<T>): Promise<T> {
    let p = map.get(sid)
    if (!p) {
      p = fetch()
      map.set(sid, p)
      // A failed fetch is not kept: the next call tries again.
      p.catch(() => map.delete(sid))
    }
    return p
  }

  /** A snapshot with its frame and full figures. */
  const detail = (sid: string, id = room()) => cached(details, sid, () => team.getSnapshot(id, sid))
  /** A snapshot's surface mesh as typed arrays. */
  const surface = (sid: string, id = room()) => cached(surfaces, sid, () => team.getSnapshotSurface(id, sid))

  return { roomId, snapshots, loading, load, save, remove, detail, surface }
})
