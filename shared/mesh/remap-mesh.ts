/**
 * Moving an existing plan mesh to a frame whose points moved (same loops, point counts, edges):
 * the connectivity and topologyKey stay, so the solver can warm start and reuse its factorisation.
 */
import type { Frame, MembraneMesh } from '../types'
import { meshPlanMinAngle, planFaceAreas } from './quantities'
import { buildVertexNeighbours } from './smoothing'

/** Below this smallest angle (degrees) a remapped mesh is refused and the frame meshed afresh. */
const MIN_REMAP_ANGLE = 12
const RELAX_SWEEPS = 8
const MAX_SHEPARD_POINTS = 64

/**
 * Returns the moved mesh, or null when the frame's loop/point structure differs from the mesh's,
 * when the mesh is not a plan mesh of this frame, or when moving would turn a triangle over or
 * leave an angle below 12°: then call meshFrame. Boundary vertices keep their fraction along their
 * frame edge; interior vertices follow a Shepard blend of the frame point moves (x, y and z),
 * relaxed by Laplacian sweeps of the displacement near the boundary.
 */
export function remapMesh(mesh: Readonly<MembraneMesh>, frame: Readonly<Frame>): MembraneMesh | null {
  if (mesh.boundaryLoops.length !== frame.loops.length) return null
  const V0 = mesh.vertices
  const nV = V0.length / 3
  const V = new Float64Array(V0)
  const isBoundary = new Uint8Array(nV)
  const moves: number[] = [] // x, y, dx, dy, dz per frame point
  for (let l = 0; l < frame.loops.length; l++) {
    const loop = frame.loops[l]!
    const B = mesh.boundaryLoops[l]!
    const corners: number[] = []
    B.forEach((v, k) => (mesh.vertexPoints[v]! >= 0 ? corners.push(k) : undefined))
    if (corners.length !== loop.points.length) return null
    for (let c = 0; c < corners.length; c++) {
      const k0 = corners[c]!,
        k1 = c + 1 < corners.length ? corners[c + 1]! : corners[0]! + B.length
      const a = B[k0]!,
        b = B[k1 % B.length]!
      if (mesh.vertexPoints[a] !== c) return null
      const p = loop.points[c]!,
        q = loop.points[(c + 1) % loop.points.length]!
      moves.push(V0[3 * a]!, V0[3 * a + 1]!, p.x - V0[3 * a]!, p.y - V0[3 * a + 1]!, p.z - V0[3 * a + 2]!)
      const chord = Math.hypot(V0[3 * b]! - V0[3 * a]!, V0[3 * b + 1]! - V0[3 * a + 1]!)
      for (let k = k0; k < k1; k++) {
        const v = B[k % B.length]!
        const t = chord > 0 ? Math.hypot(V0[3 * v]! - V0[3 * a]!, V0[3 * v + 1]! - V0[3 * a + 1]!) / chord : 0
        V[3 * v] = p.x + t * (q.x - p.x)
        V[3 * v + 1] = p.y + t * (q.y - p.y)
        V[3 * v + 2] = p.z + t * (q.z - p.z)
        isBoundary[v] = 1
      }
    }
  }
  moveInterior(V0, V, isBoundary, moves, mesh.triangles)
  const areas = planFaceAreas(new Float64Array(mesh.triangles.length / 3), V, mesh.triangles)
  for (let t = 0; t < areas.length; t++) if (!(areas[t]! > 0)) return null
  const minAngle = meshPlanMinAngle(V, mesh.triangles)
  if (minAngle < MIN_REMAP_ANGLE) return null
  return { ...mesh, vertices: V, minAngle }
}

/** Shepard blend of the frame point moves, then Jacobi-free Gauss–Seidel sweeps of the displacement. */
function moveInterior(
  V0: Float64Array,
  V: Float64Array,
  isBoundary: Uint8Array,
  moves: number[],
  T: Readonly<Uint32Array>,
): void {
  const nV = V0.length / 3
  const nm = moves.length / 5
  const D = new Float64Array(3 * nV)
  for (let v = 0; v < nV; v++) {
    if (isBoundary[v]) {
      for (let d = 0; d < 3; d++) D[3 * v + d] = V[3 * v + d]! - V0[3 * v + d]!
      continue
    }
    if (nm > MAX_SHEPARD_POINTS) continue
    let sw = 0,
      dx = 0,
      dy = 0,
      dz = 0
    for (let i = 0; i < nm; i++) {
      const w = 1 / Math.max((V0[3 * v]! - moves[5 * i]!) ** 2 + (V0[3 * v + 1]! - moves[5 * i + 1]!) ** 2, 1e-30)
      sw += w
      dx += w * moves[5 * i + 2]!
      dy += w * moves[5 * i + 3]!
      dz += w * moves[5 * i + 4]!
    }
    D[3 * v] = dx / sw
    D[3 * v + 1] = dy / sw
    D[3 * v + 2] = dz / sw
  }
  const nb = buildVertexNeighbours(nV, T)
  for (let s = 0; s < RELAX_SWEEPS; s++) {
    for (let v = 0; v < nV; v++) {
      if (isBoundary[v]) continue
      const a = nb.start[v]!,
        e = nb.start[v + 1]!
      for (let d = 0; d < 3; d++) {
        let sum = 0
        for (let k = a; k < e; k++) sum += D[3 * nb.list[k]! + d]!
        D[3 * v + d] = sum / (e - a)
      }
    }
  }
  for (let v = 0; v < nV; v++)
    if (!isBoundary[v]) for (let d = 0; d < 3; d++) V[3 * v + d] = V0[3 * v + d]! + D[3 * v + d]!
}
