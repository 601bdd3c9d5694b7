/**
 * A small three.js stage for saved surfaces (snapshot preview, comparison, printed report): z-up
 * orbit camera, render on demand, and a PNG of the current view. The live workbench has its own
 * stage (use-viewport.ts); this one shows fixed meshes only.
 */
import { onBeforeUnmount, onMounted, shallowRef, type Ref } from 'vue'
import * as THREE from 'three'
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js'

/** One mesh to show: #V×3 metres and #T×3 indices, coloured per vertex or in one colour. */
export interface SceneSurface {
  vertices: Float32Array
  triangles: Uint32Array
  /** Linear RGB per vertex (#V×3), e.g. from use-compare-colours. */
  colours?: Float32Array
  /** sRGB hex when no vertex colours. */
  colour?: string
  /** 1 = opaque; below 1 draws see-through (for overlays). */
  opacity?: number
  /** Draws the edges instead of shaded faces. */
  wireframe?: boolean
}

export interface SurfaceStage {
  show(surfaces: readonly SceneSurface[]): void
  /** PNG data URL of the current view (renders first so the buffer is current). */
  toDataUrl(): string
  canvas: HTMLCanvasElement
}

function buildMesh(s: SceneSurface): THREE.Mesh {
  const geometry = new THREE.BufferGeometry()
  geometry.setAttribute('position', new THREE.BufferAttribute(s.vertices, 3))
  geometry.setIndex(new THREE.BufferAttribute(s.triangles, 1))
  if (s.colours) geometry.setAttribute('color', new THREE.BufferAttribute(s.colours, 3))
  geometry.computeVertexNormals()
  const translucent = (s.opacity ?? 1) < 1
  const material = new THREE.MeshStandardMaterial({
    color: s.colours ? 0xffffff : new THREE.Color(s.colour ?? '#d8bf94'),
    vertexColors: Boolean(s.colours),
    side: THREE.DoubleSide,
    roughness: 0.85,
    transparent: translucent,
    opacity: s.opacity ?? 1,
    depthWrite: !translucent,
    wireframe: s.wireframe ?? false,
  })
  return new THREE.Mesh(geometry, material)
}

/**
 * Creates the stage in `host` once mounted; disposes it on unmount. `label` names the canvas for
 * tests; `plan` looks straight down instead of from the side.
 */
export function useSurfaceScene(host: Ref<HTMLElement | null>, label = 'surface-view', plan = false) {
  const stage = shallowRef<SurfaceStage | null>(null)
  let teardown = (): void => {}

  onMounted(() => {
    const el = host.value
    if (!el) return
    // preserveDrawingBuffer lets the report copy the picture to an <img> for printing.
    const renderer = new THREE.WebGLRenderer({ antialias: true, preserveDrawingBuffer: true })
    renderer.setPixelRatio(Math.min(window.devicePixelRatio, 2))
    renderer.setClearColor(0xf7f4ee)
    renderer.domElement.dataset.testid = label
    el.appendChild(renderer.domElement)
    const scene = new THREE.Scene()
    scene.add(new THREE.HemisphereLight(0xffffff, 0x8a8070, 2.2))
    const sun = new THREE.DirectionalLight(0xffffff, 1.5)
    sun.position.set(-30, -40, 60)
    scene.add(sun)
    const camera = new THREE.PerspectiveCamera(40, 1, 0.05, 5000)
    camera.up.set(0, 0, 1)
    const controls = new OrbitControls(camera, renderer.domElement)
    const group = new THREE.Group()
    scene.add(group)

    let pending = 0
    const render = (): void => {
      pending = 0
      renderer.render(scene, camera)
    }
    const requestRender = (): void => {
      if (!pending) pending = requestAnimationFrame(render)
    }
    controls.addEventListener('change', requestRender)
    const resize = (): void => {
      const w = Math.max(1, el.clientWidth)
      const h = Math.max(1, el.clientHeight)
      renderer.setSize(w, h)
      camera.aspect = w / h
      camera.updateProjectionMatrix()
      requestRender()
    }
    const observer = new ResizeObserver(resize)
    observer.observe(el)
    resize()

    const clear = (): void => {
      for (const child of [...group.children]) {
        const mesh = child as THREE.Mesh
        mesh.geometry.dispose()
        ;(mesh.material as THREE.Material).dispose()
        group.remove(mesh)
      }
    }
    const show = (surfaces: readonly SceneSurface[]): void => {
      clear()
      for (const s of surfaces) group.add(buildMesh(s))
      const box = new THREE.Box3().setFromObject(group)
      if (!box.isEmpty()) {
        const c = box.getCenter(new THREE.Vector3())
        const size = Math.max(box.max.x - box.min.x, box.max.y - box.min.y, box.max.z - box.min.z, 1)
        // Plan: straight down with north up (a slope map reads like a drawing); else a three-quarter view.
        if (plan) camera.up.set(0, 1, 0)
        if (plan) camera.position.set(c.x, c.y, c.z + 1.6 * size)
        else camera.position.set(c.x - 0.9 * size, c.y - 1.3 * size, c.z + 0.9 * size)
        controls.target.copy(c)
        controls.update()
      }
      requestRender()
    }
    stage.value = {
      show,
      canvas: renderer.domElement,
      toDataUrl: () => {
        render()
        return renderer.domElement.toDataURL('image/png')
      },
    }
    teardown = () => {
      cancelAnimationFrame(pending)
      observer.disconnect()
      controls.dispose()
      clear()
      renderer.dispose()
      renderer.domElement.remove()
    }
  })
  onBeforeUnmount(() => teardown())
  return stage
}
