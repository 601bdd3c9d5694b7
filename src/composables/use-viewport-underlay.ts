/**
 * The room's site plan under the frame: the uploaded image as a texture on a flat plane at z = 0,
 * placed by the scale saved with it (two image pixels a known distance apart, and the pixel that
 * sits at plan (0, 0)); see components/team/underlay-scale.ts. Drawn before the membrane and pushed
 * back in depth, so a frame or surface at z = 0 stays on top instead of flickering through it.
 */
import { onScopeDispose, watch, type ShallowRef } from 'vue'
import * as THREE from 'three'
import type { UnderlayMeta } from '../api/team'
import { pixelToPlan, scaleFromPoints } from '../components/team/underlay-scale'
import type { Viewport } from './use-viewport'

export interface UnderlaySource {
  meta(): UnderlayMeta | null
  /** Image address; changes when the image is replaced (cache-busting). */
  url(): string | null
  visible(): boolean
  /** 0..1 */
  opacity(): number
}

/**
 * Plan rectangle (m) covered by an image of `width`×`height` px under `meta`'s scale: centre and
 * size, y flipped (image rows run down, plan y runs north). Null when the scale cannot work.
 */
export function underlayPlacement(
  meta: UnderlayMeta,
  width: number,
  height: number,
): { cx: number; cy: number; sizeX: number; sizeY: number } | null {
  try {
    const s = scaleFromPoints({ x: meta.ax, y: meta.ay }, { x: meta.bx, y: meta.by }, meta.distance, {
      x: meta.originX,
      y: meta.originY,
    })
    const centre = pixelToPlan({ x: width / 2, y: height / 2 }, s)
    return { cx: centre.x, cy: centre.y, sizeX: width * s.metresPerPixel, sizeY: height * s.metresPerPixel }
  } catch {
    return null
  }
}

/** Keeps the underlay plane in the viewport in step with the room's underlay and the settings. */
export function useViewportUnderlay(viewport: ShallowRef<Viewport | null>, source: UnderlaySource) {
  const material = new THREE.MeshBasicMaterial({
    transparent: true,
    depthWrite: false,
    side: THREE.DoubleSide,
    polygonOffset: true,
    polygonOffsetFactor: 2,
    polygonOffsetUnits: 4,
  })
  const plane = new THREE.Mesh(new THREE.PlaneGeometry(1, 1), material)
  plane.name = 'site-plan-underlay'
  plane.renderOrder = -2
  plane.visible = false
  const loader = new THREE.TextureLoader()
  let loadedUrl: string | null = null
  let added = false

  function place(): void {
    const meta = source.meta()
    const image = material.map?.image as { width: number; height: number } | undefined
    const at = meta && image ? underlayPlacement(meta, meta.width ?? image.width, meta.height ?? image.height) : null
    plane.visible = Boolean(at) && source.visible()
    if (at) {
      plane.position.set(at.cx, at.cy, 0)
      plane.scale.set(at.sizeX, at.sizeY, 1)
    }
    material.opacity = Math.min(1, Math.max(0, source.opacity()))
    viewport.value?.requestRender()
  }

  function load(url: string | null): void {
    if (url === loadedUrl) return place()
    loadedUrl = url
    material.map?.dispose()
    material.map = null
    material.needsUpdate = true
    if (!url) return place()
    loader.load(
      url,
      (texture) => {
        if (loadedUrl !== url) return texture.dispose()
        texture.colorSpace = THREE.SRGBColorSpace
        material.map = texture
        material.needsUpdate = true
        place()
      },
      undefined,
      // a missing or unreadable image leaves the plan without an underlay; the Files tab says why
      () => place(),
    )
  }

  watch(
    [viewport, source.url, source.meta, source.visible, source.opacity],
    ([vp, url]) => {
      if (vp && !added) {
        vp.scene.add(plane)
        added = true
      }
      load(url)
    },
    { immediate: true },
  )

  onScopeDispose(() => {
    viewport.value?.scene.remove(plane)
    plane.geometry.dispose()
    material.map?.dispose()
    material.dispose()
  })
  return { plane }
}
