/**
 * Loads two snapshots for the comparison view and works out the distance colouring of B against A.
 */
import { computed, ref, shallowRef, watch, type Ref } from 'vue'
import type { SnapshotDetail } from '../api/team'
import type { SurfaceMesh } from '../../shared/protocol'
import { useSnapshotsStore } from '../stores/snapshots'
import { figureDifferences } from './use-compare'
import { DISTANCE_RAMP, legendMax, rampColours } from './use-compare-colours'
import { nearestVertexDistances } from './use-compare-distance'
import type { SceneSurface } from './use-compare-scene'

interface Side {
  detail: SnapshotDetail
  surface: SurfaceMesh
}

export function useSnapshotCompare(roomId: Ref<string>, aId: Ref<string | null>, bId: Ref<string | null>) {
  const store = useSnapshotsStore()
  const a = shallowRef<Side | null>(null)
  const b = shallowRef<Side | null>(null)
  const error = ref<string | null>(null)
  const loading = ref(false)

  async function side(sid: string): Promise<Side> {
    const [detail, surface] = await Promise.all([store.detail(sid, roomId.value), store.surface(sid, roomId.value)])
    return { detail, surface }
  }

  watch(
    [roomId, aId, bId],
    async ([, ida, idb]) => {
      a.value = null
      b.value = null
      error.value = null
      // Until two are picked the page shows its pickers; nothing to load and nothing wrong.
      if (!ida || !idb) return
      loading.value = true
      try {
        const [sa, sb] = await Promise.all([side(ida), side(idb)])
        if (aId.value !== ida || bId.value !== idb) return
        a.value = sa
        b.value = sb
      } catch (err) {
        error.value = (err as Error).message
      } finally {
        loading.value = false
      }
    },
    { immediate: true },
  )

  /** Per vertex of B, metres to the nearest vertex of A. */
  const distances = computed(() =>
    a.value && b.value ? nearestVertexDistances(a.value.surface.vertices, b.value.surface.vertices) : null,
  )
  const max = computed(() => (distances.value ? legendMax(distances.value) : 0.001))
  const bColours = computed(() => (distances.value ? rampColours(distances.value, max.value, DISTANCE_RAMP) : null))
  const rows = computed(() =>
    a.value && b.value ? figureDifferences(a.value.detail.figures, b.value.detail.figures) : [],
  )

  const viewA = computed<SceneSurface[]>(() => (a.value ? [{ ...a.value.surface, colour: '#d8bf94' }] : []))
  const viewB = computed<SceneSurface[]>(() =>
    b.value && bColours.value ? [{ ...b.value.surface, colours: bColours.value }] : [],
  )
  const overlay = computed<SceneSurface[]>(() =>
    a.value && b.value && bColours.value
      ? [
          { ...b.value.surface, colours: bColours.value },
          { ...a.value.surface, colour: '#24484d', opacity: 0.35, wireframe: true },
        ]
      : [],
  )
  return { a, b, error, loading, distances, max, rows, viewA, viewB, overlay }
}
