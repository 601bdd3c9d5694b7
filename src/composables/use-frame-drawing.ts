/**
 * Draws the frame in the viewport: rigid edges solid, cable edges dashed, a sphere handle on every
 * frame point (the selected one highlighted), and a ring in the peer's colour around each point a
 * peer holds. The whole group is rebuilt when the frame changes (frames have tens of points, so a
 * rebuild is cheap) and its old geometries and materials are disposed.
 */
import { watch, type ShallowRef } from 'vue'
import * as THREE from 'three'
import type { Peer, HeldPoint } from '../api/collaboration'
import { frameLines, framePoints, frameBounds } from '../components/workbench/frame-geometry'
import type { FrameView } from '../lib/frame-view'
import type { Viewport } from './use-viewport'

const COLOURS = {
  rigid: 0x1e2a2c,
  cable: 0x2f5d62,
  handle: 0x2f5d62,
  selected: 0xb4553d,
  grid: 0xd6cfc2,
  gridMajor: 0xbfb6a6,
}

function disposeGroup(group: THREE.Group): void {
  group.traverse((o) => {
    if (o instanceof THREE.Mesh || o instanceof THREE.LineSegments) {
      o.geometry.dispose()
      ;(o.material as THREE.Material).dispose()
    }
  })
  group.clear()
}

/** Handle radius (m) scaled to the frame, so handles stay pickable on large and small frames. */
export function handleRadius(view: Readonly<FrameView>): number {
  const b = frameBounds(view)
  const size = Math.max(b.max.x - b.min.x, b.max.y - b.min.y, 1)
  return Math.min(0.4, Math.max(0.05, size * 0.012))
}

export interface FrameDrawingSource {
  frame(): FrameView
  selection(): HeldPoint | null
  peers(): Peer[]
}

/** Keeps the frame group and the grid of the viewport in step with the source. */
export function useFrameDrawing(viewport: ShallowRef<Viewport | null>, source: FrameDrawingSource) {
  const group = new THREE.Group()
  const grid = new THREE.Group()
  let gridKey = ''

  function drawGrid(vp: Viewport, view: FrameView): void {
    const b = frameBounds(view)
    // 1 m lines, 5 m major lines; re-laid only when the frame outgrows the grid by a few metres
    const half = Math.ceil((Math.max(b.max.x - b.min.x, b.max.y - b.min.y) / 2 + 6) / 5) * 5
    const cx = Math.round((b.min.x + b.max.x) / 10) * 5
    const cy = Math.round((b.min.y + b.max.y) / 10) * 5
    const key = `${half}/${cx}/${cy}`
    if (key === gridKey) return
    gridKey = key
    disposeGroup(grid)
    for (const [step, colour] of [
      [1, COLOURS.grid],
      [5, COLOURS.gridMajor],
    ] as const) {
      const g = new THREE.GridHelper(2 * half, (2 * half) / step, colour, colour)
      g.rotation.x = Math.PI / 2
      g.position.set(cx, cy, step === 1 ? -0.002 : -0.001)
      grid.add(g)
    }
    if (!grid.parent) vp.scene.add(grid)
  }

  function draw(): void {
    const vp = viewport.value
    if (!vp) return
    const view = source.frame()
    disposeGroup(group)
    drawGrid(vp, view)
    const lines = frameLines(view)
    const rigid = new THREE.BufferGeometry()
    rigid.setAttribute('position', new THREE.BufferAttribute(lines.rigid, 3))
    group.add(new THREE.LineSegments(rigid, new THREE.LineBasicMaterial({ color: COLOURS.rigid })))
    const cable = new THREE.BufferGeometry()
    cable.setAttribute('position', new THREE.BufferAttribute(lines.cable, 3))
    const r = handleRadius(view)
    // dashes scale with the frame like the handles, so a cable reads as dashed at any size
    const dashed = new THREE.LineSegments(
      cable,
      new THREE.LineDashedMaterial({ color: COLOURS.cable, dashSize: 3 * r, gapSize: 2 * r }),
    )
    dashed.computeLineDistances()
    group.add(dashed)

    const sel = source.selection()
    const held = new Map(
      source
        .peers()
        .filter((p) => p.held)
        .map((p) => [`${p.held!.loopId}/${p.held!.pointId}`, p.color]),
    )
    for (const { loopId, point } of framePoints(view)) {
      const selected = sel?.loopId === loopId && sel.pointId === point.id
      const handle = new THREE.Mesh(
        new THREE.SphereGeometry(selected ? r * 1.35 : r, 16, 12),
        new THREE.MeshLambertMaterial({ color: selected ? COLOURS.selected : COLOURS.handle }),
      )
      handle.position.set(point.x, point.y, point.z)
      group.add(handle)
      const colour = held.get(`${loopId}/${point.id}`)
      if (colour) {
        const ring = new THREE.Mesh(
          new THREE.TorusGeometry(r * 2.2, r * 0.35, 8, 32),
          new THREE.MeshBasicMaterial({ color: colour }),
        )
        ring.position.copy(handle.position)
        group.add(ring)
      }
    }
    if (!group.parent) vp.scene.add(group)
    vp.requestRender()
  }

  watch([viewport, source.frame, source.selection, source.peers], draw)
  return { redraw: draw }
}
