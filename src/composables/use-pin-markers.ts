/**
 * Pin markers in a three.js scene: a small downward cone whose tip sits on the pinned point, in our
 * own clay for open pins and a pale slate (see-through) for resolved ones; the selected pin is
 * larger. Markers follow the pins store. `pick` tells which marker is under a pointer, so the
 * workbench can open that pin's thread instead of starting a new pin.
 */
import { effectScope, getCurrentScope, onScopeDispose, watch, type Ref } from 'vue'
import * as THREE from 'three'
import type { Pin } from '../api/team'
import type { Viewport } from './use-viewport'
import { usePinsStore } from '../stores/pins'

export const PIN_COLOURS = { open: '#9c3f2c', resolved: '#8fa3a6', selected: '#d8862f' } as const

export interface PinMarkerOptions {
  /** Cone height in metres (default 0.35 m, about an element edge on a courtyard canopy). */
  size?: number
  /** Called after markers change, for viewports that render on demand. */
  requestRender?: () => void
}

/** Makes the marker meshes for a list of pins (exported for tests and for other stages). */
export function buildPinMarkers(pins: readonly Pin[], selectedId: string | null, size: number): THREE.Group {
  const group = new THREE.Group()
  group.name = 'pin-markers'
  const geometry = new THREE.ConeGeometry(size * 0.32, size, 14)
  // Cone axis is +y in three.js: turn it to point down -z, tip at the local origin.
  geometry.rotateX(-Math.PI / 2)
  geometry.translate(0, 0, size / 2)
  for (const pin of pins) {
    const selected = pin.id === selectedId
    const material = new THREE.MeshStandardMaterial({
      color: selected ? PIN_COLOURS.selected : pin.resolved ? PIN_COLOURS.resolved : PIN_COLOURS.open,
      transparent: pin.resolved && !selected,
      opacity: pin.resolved && !selected ? 0.55 : 1,
      roughness: 0.6,
    })
    const mesh = new THREE.Mesh(geometry, material)
    mesh.position.set(pin.x, pin.y, pin.z)
    if (selected) mesh.scale.setScalar(1.4)
    mesh.userData.pinId = pin.id
    mesh.renderOrder = 2
    group.add(mesh)
  }
  return group
}

/** Draws the pins store's pins into `scene`; `camera` may be a getter (plan/3D switch). */
export function usePinMarkers(
  scene: THREE.Scene,
  camera: THREE.Camera | (() => THREE.Camera),
  options: PinMarkerOptions = {},
) {
  const store = usePinsStore()
  const size = options.size ?? 0.35
  let group: THREE.Group | null = null
  const raycaster = new THREE.Raycaster()
  const cam = (): THREE.Camera => (typeof camera === 'function' ? camera() : camera)

  function dispose(): void {
    if (!group) return
    scene.remove(group)
    const first = group.children[0] as THREE.Mesh | undefined
    first?.geometry.dispose()
    for (const m of group.children) ((m as THREE.Mesh).material as THREE.Material).dispose()
    group = null
  }

  function redraw(): void {
    dispose()
    group = buildPinMarkers(store.pins, store.selectedId, size)
    scene.add(group)
    options.requestRender?.()
  }

  /** The pin id under a point in normalised device coordinates (-1…1), or null. */
  function pick(ndc: { x: number; y: number }): string | null {
    if (!group) return null
    raycaster.setFromCamera(new THREE.Vector2(ndc.x, ndc.y), cam())
    const hit = raycaster.intersectObjects(group.children, false)[0]
    return (hit?.object.userData.pinId as string | undefined) ?? null
  }

  /** The pin id under a pointer event on `canvas`, or null. */
  function pickEvent(ev: { clientX: number; clientY: number }, canvas: HTMLElement): string | null {
    const r = canvas.getBoundingClientRect()
    return pick({ x: ((ev.clientX - r.left) / r.width) * 2 - 1, y: -((ev.clientY - r.top) / r.height) * 2 + 1 })
  }

  const stop = watch(() => [store.pins, store.selectedId] as const, redraw, { immediate: true })
  const teardown = (): void => {
    stop()
    dispose()
  }
  if (getCurrentScope()) onScopeDispose(teardown)
  return { pick, pickEvent, redraw, dispose: teardown }
}

/**
 * Pin markers on the workbench viewport (use-viewport.ts) once it exists: a click (not a drag) on a
 * marker selects that pin in the pins panel. `markerAt` lets the viewport's own click handler skip
 * starting a new pin when the click was on a marker.
 */
export function usePinMarkersIn(viewport: Ref<Viewport | null>, options: Omit<PinMarkerOptions, 'requestRender'> = {}) {
  const store = usePinsStore()
  let current: {
    scope: ReturnType<typeof effectScope>
    markers: ReturnType<typeof usePinMarkers>
    off: () => void
  } | null = null

  function detach(): void {
    current?.off()
    current?.scope.stop()
    current = null
  }

  const stop = watch(
    viewport,
    (vp) => {
      detach()
      if (!vp) return
      const scope = effectScope()
      const markers = scope.run(() =>
        usePinMarkers(vp.scene, () => vp.camera(), { ...options, requestRender: vp.requestRender }),
      )!
      let down: { x: number; y: number } | null = null
      const onDown = (e: PointerEvent): void => void (down = { x: e.clientX, y: e.clientY })
      const onUp = (e: PointerEvent): void => {
        // Orbiting the camera ends with a pointerup too: only a still click selects.
        if (!down || Math.hypot(e.clientX - down.x, e.clientY - down.y) > 4) return
        const id = markers.pickEvent(e, vp.canvas)
        if (id) store.selectedId = id
      }
      vp.canvas.addEventListener('pointerdown', onDown)
      vp.canvas.addEventListener('pointerup', onUp)
      const off = (): void => {
        vp.canvas.removeEventListener('pointerdown', onDown)
        vp.canvas.removeEventListener('pointerup', onUp)
      }
      current = { scope, markers, off }
    },
    { immediate: true },
  )

  if (getCurrentScope()) onScopeDispose(() => (stop(), detach()))
  return {
    /** The pin id under a pointer event on the viewport's canvas, or null. */
    markerAt: (ev: { clientX: number; clientY: number }): string | null =>
      current && viewport.value ? current.markers.pickEvent(ev, viewport.value.canvas) : null,
  }
}
