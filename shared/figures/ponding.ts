/**
 * Ponding pockets: interior low points whose basin would hold water. From each interior local
 * minimum of z, flood the mesh in order of increasing z (a priority flood) until a boundary vertex
 * is reached; the water level is then the highest z flooded on the way (the spill height). Vertices
 * below the spill height form the pond. Known limit: rain on the surface only, no deflection under
 * the water's weight (ponding under load is the engineer's check).
 */
import { MinHeap } from './min-heap'
import type { VertexNeighbours } from '../mesh/smoothing'

export interface PondingPocket {
  x: number
  y: number
  z: number
  /** Ponded plan area, m². */
  area: number
  /** Spill height minus the low point, m. */
  depth: number
}

/**
 * V: #V×3 (m); nb: vertex neighbours; isBoundary: #V; vertexPlanAreas: #V (m², a third of the
 * adjacent faces' plan areas). Pockets shallower than minDepth (m) are ignored.
 */
export function pondingPockets(
  V: Readonly<Float64Array>,
  nb: Readonly<VertexNeighbours>,
  isBoundary: Readonly<Uint8Array>,
  vertexPlanAreas: Readonly<Float64Array>,
  minDepth: number,
): PondingPocket[] {
  const nV = V.length / 3
  const z = (v: number): number => V[3 * v + 2]!
  const minima: number[] = []
  for (let v = 0; v < nV; v++) {
    if (isBoundary[v]) continue
    let lowest = true
    for (let k = nb.start[v]!; k < nb.start[v + 1]! && lowest; k++) if (z(nb.list[k]!) <= z(v)) lowest = false
    if (lowest && nb.start[v + 1]! > nb.start[v]!) minima.push(v)
  }
  minima.sort((a, b) => z(a) - z(b))
  const ponded = new Uint8Array(nV)
  const seen = new Int32Array(nV).fill(-1)
  const out: PondingPocket[] = []
  minima.forEach((m, run) => {
    if (ponded[m]) return
    const heap = new MinHeap()
    const order: number[] = []
    heap.push(m, z(m))
    seen[m] = run
    let level = -Infinity
    let spill = Infinity
    while (heap.size > 0) {
      const v = heap.pop()
      if (isBoundary[v]) {
        spill = Math.max(level, z(v))
        break
      }
      level = Math.max(level, z(v))
      order.push(v)
      for (let k = nb.start[v]!; k < nb.start[v + 1]!; k++) {
        const w = nb.list[k]!
        if (seen[w] === run) continue
        seen[w] = run
        heap.push(w, z(w))
      }
    }
    if (!(spill - z(m) > minDepth)) return
    let area = 0
    for (const v of order) {
      if (z(v) < spill) {
        ponded[v] = 1
        area += vertexPlanAreas[v]!
      }
    }
    out.push({ x: V[3 * m]!, y: V[3 * m + 1]!, z: z(m), area, depth: spill - z(m) })
  })
  return out
}
