/**
 * Pointer editing of the frame in the viewport. A press near a handle selects that point; an
 * editor then drags it across the plane z = its height (plan move), or with Shift/Alt held moves it
 * up and down by the pointer's vertical travel. Double-click near an edge inserts a point there;
 * in hole mode a click places a small ring; Delete removes the selected point. Moves are sent at
 * most once per animation frame, and each drag is one undo step.
 */
import { onBeforeUnmount, ref, watch, type ShallowRef } from 'vue'
import { framePoints, frameLines } from '../components/workbench/frame-geometry'
import { holeRing, nearestPoint2D, nearestSegment2D, rayPlaneZ } from '../components/workbench/picking'
import { heightFromDrag, snapPlan, snapValue } from '../lib/snapping'
import { useWorkbenchStore } from '../stores/workbench'
import type { Viewport } from './use-viewport'

/** Pick tolerance around handles and edges, CSS pixels. */
const PICK_PX = 12
/** Radius of a new hole ring, m. */
const HOLE_RADIUS = 0.5

interface Drag {
  loopId: string
  pointId: string
  startY: number
  startZ: number
  vertical: boolean
  moved: boolean
}

/** A press and release closer than this (px) is a click, not an orbit or pan. */
const CLICK_SLOP_PX = 4

export interface FrameDragOptions {
  /** A click that hit no handle and moved no camera (for pins and surface picks). */
  onClick?(ev: PointerEvent): void
  onDoubleClick?(): void
}

/** Wires pointer and key events of the viewport canvas to frame edits. */
export function useFrameDrag(viewport: ShallowRef<Viewport | null>, options: FrameDragOptions = {}) {
  const store = useWorkbenchStore()
  /** True while the next click places a hole ring. */
  const placingHole = ref(false)
  let drag: Drag | null = null
  let press: { x: number; y: number } | null = null
  let queued: { x?: number; y?: number; z?: number } | null = null
  let frameRequest = 0

  const pickPoint = (vp: Viewport, ev: PointerEvent | MouseEvent) => {
    const pts = framePoints(store.frame)
    const r = vp.canvas.getBoundingClientRect()
    const hit = nearestPoint2D(
      { x: ev.clientX - r.left, y: ev.clientY - r.top },
      pts.map((p) => vp.project(p.point)),
      PICK_PX,
    )
    return hit ? pts[hit.index] : undefined
  }

  function flush(): void {
    frameRequest = 0
    if (drag && queued) store.move(drag.loopId, drag.pointId, queued)
    queued = null
  }

  function onPointerDown(ev: PointerEvent): void {
    const vp = viewport.value
    if (!vp || ev.button !== 0) return
    vp.canvas.focus()
    if (placingHole.value) return placeHole(vp, ev)
    const hit = pickPoint(vp, ev)
    press = hit ? null : { x: ev.clientX, y: ev.clientY }
    if (!hit) return
    store.select({ loopId: hit.loopId, pointId: hit.point.id })
    if (store.readOnly) return
    store.beginGesture()
    drag = {
      loopId: hit.loopId,
      pointId: hit.point.id,
      startY: ev.clientY,
      startZ: hit.point.z,
      vertical: ev.shiftKey || ev.altKey,
      moved: false,
    }
    vp.controls().enabled = false
    vp.canvas.setPointerCapture(ev.pointerId)
    ev.preventDefault()
  }

  function onPointerMove(ev: PointerEvent): void {
    const vp = viewport.value
    if (!vp || !drag) return
    drag.moved = true
    if (drag.vertical) {
      const mpp = vp.metresPerPixel(
        framePoints(store.frame).find((p) => p.point.id === drag!.pointId)?.point ?? { x: 0, y: 0, z: drag.startZ },
      )
      queued = { z: heightFromDrag(drag.startZ, ev.clientY - drag.startY, mpp, store.snapStep, store.snapOn) }
    } else {
      const ray = vp.ray(ev)
      const at = rayPlaneZ(ray.origin, ray.direction, drag.startZ)
      if (!at) return
      queued = snapPlan(at, store.snapStep, store.snapOn)
    }
    if (!frameRequest) frameRequest = requestAnimationFrame(flush)
  }

  function onPointerUp(ev: PointerEvent): void {
    const vp = viewport.value
    if (press && ev.type === 'pointerup' && Math.hypot(ev.clientX - press.x, ev.clientY - press.y) < CLICK_SLOP_PX)
      options.onClick?.(ev)
    press = null
    if (!drag || !vp) return
    if (frameRequest) cancelAnimationFrame(frameRequest)
    flush()
    drag = null
    vp.controls().enabled = true
    if (vp.canvas.hasPointerCapture(ev.pointerId)) vp.canvas.releasePointerCapture(ev.pointerId)
    store.endGesture()
  }

  function onDoubleClick(ev: MouseEvent): void {
    options.onDoubleClick?.()
    const vp = viewport.value
    if (!vp || store.readOnly || pickPoint(vp, ev)) return
    const { segments } = frameLines(store.frame)
    const r = vp.canvas.getBoundingClientRect()
    const hit = nearestSegment2D(
      { x: ev.clientX - r.left, y: ev.clientY - r.top },
      segments.map((s) => ({ a: vp.project(s.a), b: vp.project(s.b) })),
      PICK_PX,
    )
    const seg = hit ? segments[hit.index] : undefined
    if (!hit || !seg) return
    const lerp = (k: 'x' | 'y' | 'z') => seg.a[k] + hit.t * (seg.b[k] - seg.a[k])
    const plan = snapPlan({ x: lerp('x'), y: lerp('y') }, store.snapStep, store.snapOn)
    store.insertAfter(seg.loopId, seg.pointId, { ...plan, z: snapValue(lerp('z'), store.snapOn ? store.snapStep : 0) })
  }

  function placeHole(vp: Viewport, ev: PointerEvent): void {
    placingHole.value = false
    if (store.readOnly) return
    const outer = store.frame.loops.find((l) => l.role === 'outer')?.points ?? []
    const z = outer.length ? Math.round((outer.reduce((s, p) => s + p.z, 0) / outer.length) * 100) / 100 : 0
    const ray = vp.ray(ev)
    const at = rayPlaneZ(ray.origin, ray.direction, z)
    if (!at) return
    store.addHole(holeRing(snapPlan(at, store.snapStep, store.snapOn), HOLE_RADIUS, z))
  }

  function onKeyDown(ev: KeyboardEvent): void {
    if (ev.key === 'Escape') placingHole.value = false
    const sel = store.selection
    if ((ev.key === 'Delete' || ev.key === 'Backspace') && sel && !store.readOnly) {
      store.removePoint(sel.loopId, sel.pointId)
      ev.preventDefault()
    }
  }

  const listeners = [
    ['pointerdown', onPointerDown],
    ['pointermove', onPointerMove],
    ['pointerup', onPointerUp],
    ['pointercancel', onPointerUp],
    ['dblclick', onDoubleClick],
    ['keydown', onKeyDown],
  ] as const
  watch(viewport, (vp, old) => {
    for (const [name, fn] of listeners)
      old?.canvas.removeEventListener(name, fn as EventListener, name === 'pointerdown')
    // capture phase: a press on a handle must reach us before OrbitControls starts orbiting
    for (const [name, fn] of listeners) vp?.canvas.addEventListener(name, fn as EventListener, name === 'pointerdown')
  })
  onBeforeUnmount(() => {
    if (frameRequest) cancelAnimationFrame(frameRequest)
    for (const [name, fn] of listeners)
      viewport.value?.canvas.removeEventListener(name, fn as EventListener, name === 'pointerdown')
  })

  return { placingHole }
}
