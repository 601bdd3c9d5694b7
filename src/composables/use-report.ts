import { computed, ref, shallowRef, watch, type Ref } from 'vue'
import { ApiError, getRoom, type RoomDetail } from '../api/http'
import { getCurrentResult, getSnapshotResult } from '../api/report'
import { getSnapshot, listPins, listSnapshots, type Pin, type SnapshotSummary } from '../api/team'
import type { Surface } from '../../shared/protocol'
import { reportTables } from '../../shared/report'
import type { Frame } from '../../shared/types'

/** What a report is made from: a saved snapshot, or the room's current settled state (unsaved). */
export type ReportSource = { kind: 'snapshot'; id: string } | { kind: 'current' }

/** A loaded report: the surface, the frame it was solved from, and how it was saved (if it was). */
export interface ReportState {
  frame: Frame
  surface: Surface
  /** Null for the current state, which is not saved. */
  saved: { name: string; note: string; author: string; createdAt: string } | null
}

/**
 * Loads the room, its snapshots, its open pins (oldest first: the report numbers
 * them in that order) and the chosen source; again when the room or the source changes.
 */
export function useReport(roomId: Ref<string>, source: Ref<ReportSource | null>) {
  const room = shallowRef<RoomDetail | null>(null)
  const snapshots = shallowRef<SnapshotSummary[]>([])
  const pins = shallowRef<Pin[]>([])
  const state = shallowRef<ReportState | null>(null)
  const error = ref<string | null>(null)
  const loading = ref(false)
  let generation = 0

  async function loadRoom(): Promise<void> {
    const [r, s] = await Promise.all([getRoom(roomId.value), listSnapshots(roomId.value)])
    room.value = r
    snapshots.value = s
  }

  async function loadSource(src: ReportSource): Promise<ReportState> {
    if (src.kind === 'current') {
      const { frame, ...surface } = await getCurrentResult(roomId.value)
      return { frame, surface, saved: null }
    }
    const [detail, surface] = await Promise.all([
      getSnapshot(roomId.value, src.id),
      getSnapshotResult(roomId.value, src.id),
    ])
    const saved = {
      name: detail.name,
      note: detail.note,
      author: detail.author?.name ?? 'a former member',
      createdAt: detail.createdAt,
    }
    return { frame: detail.frame, surface, saved }
  }

  /** Loads everything for the current room and source. */
  async function load(): Promise<void> {
    const mine = ++generation
    error.value = null
    state.value = null
    loading.value = true
    try {
      await loadRoom()
      if (!source.value || mine !== generation) return
      const [s, p] = await Promise.all([loadSource(source.value), listPins(roomId.value)])
      if (mine !== generation) return
      pins.value = p.filter((x) => !x.resolved).sort((a, b) => Date.parse(a.createdAt) - Date.parse(b.createdAt))
      state.value = s
    } catch (err) {
      if (mine !== generation) return
      error.value =
        err instanceof ApiError && err.code === 'no_surface'
          ? 'The room has no settled surface for its latest edit yet. Try again once the solver reports “settled”, or choose a saved snapshot.'
          : (err as Error).message
    } finally {
      if (mine === generation) loading.value = false
    }
  }

  const tables = computed(() =>
    state.value
      ? reportTables({
          frame: state.value.frame,
          figures: state.value.surface.figures,
          solver: state.value.surface.solver,
          pins: pins.value,
        })
      : [],
  )

  watch([roomId, source], load, { immediate: true })
  return { room, snapshots, pins, state, tables, error, loading, reload: load }
}
