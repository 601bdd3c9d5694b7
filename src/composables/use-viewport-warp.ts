/**
 * The warp direction drawn on the solved surface (strokes from warp-marks.ts), redrawn when the
 * surface or the warp angle changes. A bad or missing angle (a document being edited) hides them.
 */
import { watch, type ShallowRef } from 'vue'
import * as THREE from 'three'
import { warpMarks } from '../components/workbench/warp-marks'
import type { SurfaceMesh } from '../../shared/protocol'
import type { Viewport } from './use-viewport'

export interface WarpSource {
  surface(): SurfaceMesh | null
  /** Degrees counter-clockwise from +x in plan. */
  warpAngle(): number
}

/** Keeps the warp strokes in the viewport in step with the surface and the warp angle. */
export function useViewportWarp(viewport: ShallowRef<Viewport | null>, source: WarpSource): void {
  const strokes = new THREE.LineSegments(
    new THREE.BufferGeometry(),
    new THREE.LineBasicMaterial({ color: 0x8a3b12, transparent: true, opacity: 0.75 }),
  )
  strokes.name = 'warp-direction'
  function update(): void {
    const vp = viewport.value
    if (!vp) return
    const s = source.surface()
    const angle = source.warpAngle()
    strokes.visible = s !== null && Number.isFinite(angle)
    if (s && Number.isFinite(angle)) {
      strokes.geometry.dispose()
      strokes.geometry = new THREE.BufferGeometry()
      strokes.geometry.setAttribute('position', new THREE.BufferAttribute(warpMarks(s.vertices, s.triangles, angle), 3))
      if (!strokes.parent) vp.scene.add(strokes)
    }
    vp.requestRender()
  }
  watch([viewport, source.surface, source.warpAngle], update)
}
