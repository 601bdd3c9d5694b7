/**
 * Pins in the workbench viewport: the markers (and selecting a pin by clicking its marker) come from
 * usePinMarkersIn; here a plain click (no drag) that misses every marker and hits the surface starts
 * a new pin there, for roles that may pin. A click is held back briefly so that a double-click,
 * which adds a frame point, never also starts a pin.
 */
import { onBeforeUnmount, type ShallowRef } from 'vue'
import * as THREE from 'three'
import { canAddPins } from './use-pin-filters'
import { usePinMarkersIn } from './use-pin-markers'
import { usePinsStore } from '../stores/pins'
import { useWorkbenchStore } from '../stores/workbench'
import type { Viewport } from './use-viewport'

/** Longer than a double-click's gap on most systems (commonly 500 ms at most; recalled, not measured). */
const CLICK_DELAY_MS = 300

/** A point picked on the solved surface, m, with the document version the surface was solved from. */
export interface SurfacePick {
  x: number
  y: number
  z: number
  version: number
}

/** Where a pointer event meets the surface mesh, or null. */
export function pickSurface(
  vp: Viewport,
  mesh: THREE.Mesh,
  ev: { clientX: number; clientY: number },
): THREE.Vector3 | null {
  if (!mesh.visible) return null
  const raycaster = new THREE.Raycaster()
  raycaster.ray.copy(vp.ray(ev))
  return raycaster.intersectObject(mesh, false)[0]?.point ?? null
}

/** Wires pin markers and surface clicks; `onPick` also hears every surface pick. */
export function useViewportPins(
  viewport: ShallowRef<Viewport | null>,
  mesh: THREE.Mesh,
  onPick?: (p: SurfacePick) => void,
) {
  const pins = usePinsStore()
  const workbench = useWorkbenchStore()
  const { markerAt } = usePinMarkersIn(viewport)
  let timer: ReturnType<typeof setTimeout> | undefined

  function handle(ev: { clientX: number; clientY: number }): void {
    const vp = viewport.value
    // a click on a marker opens that pin (usePinMarkersIn does it), never starts a new one
    if (!vp || markerAt(ev)) return
    const hit = pickSurface(vp, mesh, ev)
    const surface = workbench.surface
    if (!hit || !surface) return
    const pick = { x: hit.x, y: hit.y, z: hit.z, version: surface.version }
    onPick?.(pick)
    if (canAddPins(workbench.role)) pins.startDraft(pick, pick.version)
  }

  /** A click on empty space or the surface (not on a frame handle, not the end of a drag). */
  function click(ev: { clientX: number; clientY: number }): void {
    clearTimeout(timer)
    const at = { clientX: ev.clientX, clientY: ev.clientY }
    timer = setTimeout(() => handle(at), CLICK_DELAY_MS)
  }
  /** Cancels a pending click: it was the first half of a double-click. */
  const cancelClick = (): void => clearTimeout(timer)

  onBeforeUnmount(() => clearTimeout(timer))
  return { click, cancelClick }
}
