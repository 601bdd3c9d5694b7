/**
 * Seam editing for the pattern tab: the room's seam families and cut settings as read from the
 * document, and the edits (each one undoable by its author alone, shared with everyone live).
 */
import { computed } from 'vue'
import {
  addSeamFamily,
  DEFAULT_CUT_SETTINGS,
  removeSeamFamily,
  setCutSettings,
  updateSeamFamily,
} from '../../shared/room-doc/seams'
import type { SeamFamily } from '../../shared/pattern/families'
import { useWorkbenchStore } from '../stores/workbench'

export type CutSettingKey = keyof typeof DEFAULT_CUT_SETTINGS

export function useSeams() {
  const store = useWorkbenchStore()
  const families = computed<SeamFamily[]>(() => (store.cuts?.ok ? store.cuts.cuts.families : []))
  const settings = computed(() => (store.cuts?.ok ? store.cuts.cuts.settings : null))
  const problem = computed(() => (store.cuts && !store.cuts.ok ? store.cuts : null))

  /** Plan centre and extent of the frame, for sensible defaults. */
  const frameBox = computed(() => {
    const pts = store.frame.loops.flatMap((l) => l.points)
    if (pts.length === 0) return { cx: 0, cy: 0, points: pts }
    const xs = pts.map((p) => p.x),
      ys = pts.map((p) => p.y)
    return { cx: (Math.min(...xs) + Math.max(...xs)) / 2, cy: (Math.min(...ys) + Math.max(...ys)) / 2, points: pts }
  })

  /** Parallel seams running along the warp, spaced to fit the roll with its allowances. */
  function addParallel(warpAngle: number, rollWidth = DEFAULT_CUT_SETTINGS.rollWidth): void {
    const spacing = Math.max(0.3, Math.round((rollWidth - 2 * DEFAULT_CUT_SETTINGS.seamAllowance - 0.2) * 10) / 10)
    store.editSeams((doc, origin) =>
      addSeamFamily(doc, { kind: 'parallel', angle: warpAngle + 90, spacing, offset: 0 }, origin),
    )
  }
  function addRadial(): void {
    const { cx, cy } = frameBox.value
    store.editSeams((doc, origin) =>
      addSeamFamily(doc, { kind: 'radial', x: round(cx), y: round(cy), count: 4, startAngle: 0 }, origin),
    )
  }
  /** A geodesic between the first two frame points (the picked ones are then edited). */
  function addGeodesic(): void {
    const [a, b] = frameBox.value.points
    if (!a || !b) return
    store.editSeams((doc, origin) =>
      addSeamFamily(doc, { kind: 'geodesic', from: [a.x, a.y, a.z], to: [b.x, b.y, b.z] }, origin),
    )
  }
  const update = (id: string, patch: Record<string, number | number[]>) =>
    store.editSeams((doc, origin) => updateSeamFamily(doc, id, patch, origin))
  const remove = (id: string) => store.editSeams((doc, origin) => removeSeamFamily(doc, id, origin))
  const setSetting = (patch: Partial<Record<CutSettingKey, number>> & { warpAngle?: number | null }) =>
    store.editSeams((doc, origin) => setCutSettings(doc, patch, origin))

  return { families, settings, problem, addParallel, addRadial, addGeodesic, update, remove, setSetting }
}

const round = (x: number) => Math.round(x * 100) / 100
