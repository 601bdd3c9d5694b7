/**
 * The solved membrane in the viewport. One BufferGeometry is kept and its arrays are refilled in
 * place when a new surface arrives with the same vertex and triangle counts (the usual case while
 * someone drags a point); only a change of mesh size allocates new buffers. Vertex colours follow
 * the colour mode and the range mapped is handed back for the legend.
 */
import { shallowRef, watch, type ShallowRef } from 'vue'
import * as THREE from 'three'
import { surfaceColours, type ColourMode, type ColourRange } from '../lib/colour-maps'
import type { SurfaceMesh } from '../../shared/protocol'
import type { Viewport } from './use-viewport'
import { DEFAULT_FLAT_THRESHOLD } from '../../shared/figures/compute-figures'

// The engine's own default, so the map and the flat-share figure agree before figures arrive.
export { DEFAULT_FLAT_THRESHOLD }

export interface SurfaceSource {
  surface(): SurfaceMesh | null
  colourMode(): ColourMode
  flatThreshold(): number | undefined
}

/** Keeps a coloured membrane mesh in the viewport in step with the streamed surface. */
export function useViewportSurface(viewport: ShallowRef<Viewport | null>, source: SurfaceSource) {
  const range = shallowRef<ColourRange | null>(null)
  const geometry = new THREE.BufferGeometry()
  const material = new THREE.MeshLambertMaterial({
    vertexColors: true,
    side: THREE.DoubleSide,
    transparent: true,
    opacity: 0.92,
  })
  const mesh = new THREE.Mesh(geometry, material)
  mesh.renderOrder = -1
  const wire = new THREE.LineSegments(
    new THREE.WireframeGeometry(),
    new THREE.LineBasicMaterial({ color: 0x24484d, transparent: true, opacity: 0.12 }),
  )

  function fill(name: 'position' | 'color', data: Float32Array): void {
    const attr = geometry.getAttribute(name) as THREE.BufferAttribute | undefined
    if (attr && attr.array.length === data.length) {
      ;(attr.array as Float32Array).set(data)
      attr.needsUpdate = true
    } else {
      geometry.setAttribute(name, new THREE.BufferAttribute(data, 3))
    }
  }

  function update(): void {
    const vp = viewport.value
    if (!vp) return
    const s = source.surface()
    if (!s) {
      mesh.visible = wire.visible = false
      range.value = null
      vp.requestRender()
      return
    }
    fill('position', s.vertices.slice())
    const index = geometry.getIndex()
    if (index && index.array.length === s.triangles.length) {
      ;(index.array as Uint32Array).set(s.triangles)
      index.needsUpdate = true
    } else {
      geometry.setIndex(new THREE.BufferAttribute(s.triangles.slice(), 1))
    }
    recolour()
    geometry.computeVertexNormals()
    geometry.computeBoundingSphere()
    wire.geometry.dispose()
    wire.geometry = new THREE.WireframeGeometry(geometry)
    mesh.visible = wire.visible = true
    if (!mesh.parent) vp.scene.add(mesh, wire)
    vp.requestRender()
  }

  function recolour(): void {
    const s = source.surface()
    if (!s) return
    const colours = new Float32Array(s.vertices.length)
    range.value = surfaceColours(
      colours,
      s.vertices,
      s.triangles,
      source.colourMode(),
      source.flatThreshold() ?? DEFAULT_FLAT_THRESHOLD,
    )
    fill('color', colours)
  }

  watch([viewport, source.surface], update)
  watch([source.colourMode, source.flatThreshold], () => {
    recolour()
    viewport.value?.requestRender()
  })

  return { range, mesh }
}
