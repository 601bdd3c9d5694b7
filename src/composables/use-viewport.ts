/**
 * The three.js stage of the workbench: renderer, scene, a z-up perspective camera for 3D and a
 * top-down orthographic camera for plan, each with its own OrbitControls (the plan one cannot
 * rotate). Frames are rendered on demand only — after a control change, a data change or a resize —
 * so an idle room costs nothing.
 */
import { onBeforeUnmount, onMounted, ref, shallowRef, type Ref } from 'vue'
import * as THREE from 'three'
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js'

export type ViewMode = 'plan' | '3d'

/** CSS pixels along each side of the canvas that overlays cover. */
export interface Insets {
  top: number
  right: number
  bottom: number
  left: number
}
const NO_INSETS: Insets = { top: 0, right: 0, bottom: 0, left: 0 }

export interface Viewport {
  scene: THREE.Scene
  camera(): THREE.Camera
  controls(): OrbitControls
  /** Schedules one render on the next animation frame (repeated calls coalesce). */
  requestRender(): void
  setMode(mode: ViewMode): void
  /**
   * Frames a plan box (m) in both cameras, inside the part of the canvas that `insets` (CSS px
   * covered by overlays: toolbar, legend, hint) leave free.
   */
  fit(min: THREE.Vector3Like, max: THREE.Vector3Like, insets?: Insets): void
  /** Screen position (CSS px relative to the canvas) of a world point. */
  project(p: THREE.Vector3Like): { x: number; y: number }
  /** World ray under a pointer event. */
  ray(ev: { clientX: number; clientY: number }): THREE.Ray
  /** Metres per CSS pixel at a world point, for vertical drags. */
  metresPerPixel(at: THREE.Vector3Like): number
  canvas: HTMLCanvasElement
}

/** Creates the stage inside `host` once mounted; everything is disposed on unmount. */
export function useViewport(host: Ref<HTMLElement | null>, initialMode: ViewMode) {
  const viewport = shallowRef<Viewport | null>(null)
  /** Why the stage could not be created (no WebGL), for the component to show. */
  const failure = ref<string | null>(null)
  let teardown = (): void => {}

  onMounted(() => {
    const el = host.value
    if (!el) return
    let renderer: THREE.WebGLRenderer
    try {
      // preserveDrawingBuffer lets browser tests read the canvas pixels back
      renderer = new THREE.WebGLRenderer({ antialias: true, preserveDrawingBuffer: true })
    } catch (err) {
      failure.value = `The 3D view needs WebGL, which this browser could not start (${(err as Error).message}). The tables and figures still work.`
      return
    }
    renderer.setPixelRatio(Math.min(window.devicePixelRatio, 2))
    renderer.setClearColor(0xf7f4ee)
    const canvas = renderer.domElement
    canvas.dataset.testid = 'viewport-canvas'
    canvas.tabIndex = 0
    el.appendChild(canvas)

    const scene = new THREE.Scene()
    scene.add(new THREE.HemisphereLight(0xffffff, 0x8a8070, 2.2))
    const sun = new THREE.DirectionalLight(0xffffff, 1.6)
    sun.position.set(-30, -40, 60)
    scene.add(sun)

    const persp = new THREE.PerspectiveCamera(45, 1, 0.05, 2000)
    persp.up.set(0, 0, 1)
    const ortho = new THREE.OrthographicCamera(-10, 10, 10, -10, -1000, 1000)
    ortho.up.set(0, 1, 0)
    const perspControls = new OrbitControls(persp, canvas)
    const orthoControls = new OrbitControls(ortho, canvas)
    orthoControls.enableRotate = false
    orthoControls.screenSpacePanning = true
    let mode: ViewMode = initialMode
    const active = () => (mode === 'plan' ? { cam: ortho, ctl: orthoControls } : { cam: persp, ctl: perspControls })

    let pending = 0
    const render = (): void => {
      pending = 0
      renderer.render(scene, active().cam)
    }
    const requestRender = (): void => {
      if (!pending) pending = requestAnimationFrame(render)
    }
    perspControls.addEventListener('change', requestRender)
    orthoControls.addEventListener('change', requestRender)

    const resize = (): void => {
      const w = Math.max(1, el.clientWidth)
      const h = Math.max(1, el.clientHeight)
      renderer.setSize(w, h)
      persp.aspect = w / h
      persp.updateProjectionMatrix()
      const halfH = (ortho.top - ortho.bottom) / 2
      const cx = (ortho.left + ortho.right) / 2
      ortho.left = cx - (halfH * w) / h
      ortho.right = cx + (halfH * w) / h
      ortho.updateProjectionMatrix()
      requestRender()
    }
    const observer = new ResizeObserver(resize)
    observer.observe(el)

    const setMode = (m: ViewMode): void => {
      mode = m
      perspControls.enabled = m === '3d'
      orthoControls.enabled = m === 'plan'
      requestRender()
    }

    const fit = (min: THREE.Vector3Like, max: THREE.Vector3Like, insets: Insets = NO_INSETS): void => {
      const c = new THREE.Vector3((min.x + max.x) / 2, (min.y + max.y) / 2, (min.z + max.z) / 2)
      const radius = Math.max(1, new THREE.Vector3(max.x - min.x, max.y - min.y, max.z - min.z).length() / 2)
      const w = Math.max(1, el.clientWidth)
      const h = Math.max(1, el.clientHeight)
      // The free rectangle, never under 40 % of the canvas (a tiny canvas still shows the structure).
      const sw = Math.max(0.4 * w, w - insets.left - insets.right)
      const sh = Math.max(0.4 * h, h - insets.top - insets.bottom)
      // Screen offset (px, y down) of the free rectangle's centre from the canvas centre.
      const ox = (insets.left - insets.right) / 2
      const oy = (insets.top - insets.bottom) / 2
      const aspect = w / h
      // the bounding sphere must fit the narrower of the two fields of view, with a margin
      const tanV = Math.tan(THREE.MathUtils.degToRad(persp.fov / 2))
      const halfFov = Math.atan(Math.min(tanV * (sh / h), tanV * aspect * (sw / w)))
      const distance = (1.15 * radius) / Math.sin(halfFov)
      const dir = new THREE.Vector3(-0.45, -0.75, 0.5).normalize()
      persp.position.copy(c).addScaledVector(dir, distance)
      persp.lookAt(c)
      // Shift camera and target together so the centre lands in the middle of the free rectangle.
      const perPixel = (2 * distance * tanV) / h
      persp.updateMatrixWorld()
      const right = new THREE.Vector3().setFromMatrixColumn(persp.matrixWorld, 0)
      const up = new THREE.Vector3().setFromMatrixColumn(persp.matrixWorld, 1)
      const shift = right.multiplyScalar(-ox * perPixel).addScaledVector(up, oy * perPixel)
      persp.position.add(shift)
      perspControls.target.copy(c).add(shift)
      perspControls.update()
      // Plan: metres per pixel so the box (with a margin) fits the free rectangle.
      const m = Math.max(((max.x - min.x) * 1.15) / sw, ((max.y - min.y) * 1.15) / sh, 2 / sh)
      Object.assign(ortho, { left: (-w / 2) * m, right: (w / 2) * m, top: (h / 2) * m, bottom: (-h / 2) * m, zoom: 1 })
      ortho.position.set(c.x - ox * m, c.y + oy * m, 500)
      orthoControls.target.set(c.x - ox * m, c.y + oy * m, 0)
      ortho.updateProjectionMatrix()
      orthoControls.update()
      requestRender()
    }

    const ndc = (ev: { clientX: number; clientY: number }): THREE.Vector2 => {
      const r = canvas.getBoundingClientRect()
      return new THREE.Vector2(((ev.clientX - r.left) / r.width) * 2 - 1, -((ev.clientY - r.top) / r.height) * 2 + 1)
    }
    const raycaster = new THREE.Raycaster()
    const ray = (ev: { clientX: number; clientY: number }): THREE.Ray => {
      raycaster.setFromCamera(ndc(ev), active().cam)
      return raycaster.ray.clone()
    }
    const project = (p: THREE.Vector3Like): { x: number; y: number } => {
      const v = new THREE.Vector3(p.x, p.y, p.z).project(active().cam)
      return { x: ((v.x + 1) / 2) * canvas.clientWidth, y: ((1 - v.y) / 2) * canvas.clientHeight }
    }
    const metresPerPixel = (at: THREE.Vector3Like): number => {
      const h = Math.max(1, canvas.clientHeight)
      if (mode === 'plan') return (ortho.top - ortho.bottom) / ortho.zoom / h
      const d = persp.position.distanceTo(new THREE.Vector3(at.x, at.y, at.z))
      return (2 * d * Math.tan(THREE.MathUtils.degToRad(persp.fov / 2))) / h
    }

    setMode(initialMode)
    resize()
    viewport.value = {
      scene,
      canvas,
      requestRender,
      setMode,
      fit,
      project,
      ray,
      metresPerPixel,
      camera: () => active().cam,
      controls: () => active().ctl,
    }
    teardown = () => {
      if (pending) cancelAnimationFrame(pending)
      observer.disconnect()
      perspControls.dispose()
      orthoControls.dispose()
      scene.traverse((o) => {
        if (o instanceof THREE.Mesh || o instanceof THREE.LineSegments) {
          o.geometry.dispose()
          const m = o.material as THREE.Material | THREE.Material[]
          for (const mat of Array.isArray(m) ? m : [m]) mat.dispose()
        }
      })
      renderer.dispose()
      canvas.remove()
    }
  })

  onBeforeUnmount(() => {
    teardown()
    viewport.value = null
  })

  return { viewport, failure }
}
