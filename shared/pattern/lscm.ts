/**
 * First flattening: least-squares conformal maps (B. Lévy, S. Petitjean, N. Ray, J. Maillot,
 * "Least squares conformal maps for automatic texture atlas generation", SIGGRAPH 2002), written
 * as Dirichlet energy minus signed image area (the same energy, P. Mullen et al., "Spectral
 * conformal parameterization", SGP 2008): E = ½Σ cot θ |Δu|²/2 … − A(u, v), two vertices pinned.
 * A developable strip has a zero-energy conformal map that is an isometry up to scale, so after
 * the area rescale below it is exact.
 */
import { csrFromRows, csrSlot, ldlFactor, ldlSolve, ldlSymbolic, minimumDegreeOrdering } from '../linalg'
import type { TriangleFrames } from './triangle-frames'

/**
 * Returns flat positions #n×2 Float64Array (m). triangles: #t×3; boundaryEdges: #b×2 directed as
 * in the triangles; pins: two distinct vertices (placed at their spatial distance on the u axis).
 * The result is scaled so that its area equals the 3D area.
 */
export function lscmFlatten(
  vertices: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  frames: Readonly<TriangleFrames>,
  boundaryEdges: Readonly<Int32Array>,
  pins: readonly [number, number],
): Float64Array {
  const n = vertices.length / 3
  const dofIndex = new Int32Array(2 * n).fill(-1)
  let free = 0
  for (let d = 0; d < 2 * n; d++) if (d >> 1 !== pins[0] && d >> 1 !== pins[1]) dofIndex[d] = free++
  const [p0, p1] = pins
  const spanning = Math.hypot(
    vertices[3 * p1]! - vertices[3 * p0]!,
    vertices[3 * p1 + 1]! - vertices[3 * p0 + 1]!,
    vertices[3 * p1 + 2]! - vertices[3 * p0 + 2]!,
  )
  const pinned = new Float64Array(2 * n)
  pinned[2 * p1] = spanning
  // entries (dof r, dof c, value); the pattern is built from them, then summed in
  const entries: number[] = []
  const push = (r: number, c: number, value: number) => entries.push(r, c, value)
  for (let t = 0; t < triangles.length / 3; t++) {
    for (let k = 0; k < 3; k++) {
      const i = triangles[3 * t + ((k + 1) % 3)]!,
        j = triangles[3 * t + ((k + 2) % 3)]!
      const w = frames.cotangents[3 * t + k]! / 2
      for (let d = 0; d < 2; d++) {
        push(2 * i + d, 2 * i + d, w)
        push(2 * j + d, 2 * j + d, w)
        push(2 * i + d, 2 * j + d, -w)
        push(2 * j + d, 2 * i + d, -w)
      }
    }
  }
  for (let e = 0; e < boundaryEdges.length; e += 2) {
    const i = boundaryEdges[e]!,
      j = boundaryEdges[e + 1]!
    // −A = −½(u_i v_j − u_j v_i) as ½zᵀMz: symmetric entries ∓½
    push(2 * i, 2 * j + 1, -0.5)
    push(2 * j + 1, 2 * i, -0.5)
    push(2 * j, 2 * i + 1, 0.5)
    push(2 * i + 1, 2 * j, 0.5)
  }
  const rows: number[][] = Array.from({ length: free }, () => [])
  for (let e = 0; e < entries.length; e += 3) {
    const r = dofIndex[entries[e]!]!,
      c = dofIndex[entries[e + 1]!]!
    if (r >= 0 && c >= 0) rows[r]!.push(c)
  }
  const matrix = csrFromRows(rows)
  const rhs = new Float64Array(free)
  for (let e = 0; e < entries.length; e += 3) {
    const r = dofIndex[entries[e]!]!,
      c = dofIndex[entries[e + 1]!]!
    if (r < 0) continue
    if (c >= 0) matrix.values[csrSlot(matrix, r, c)]! += entries[e + 2]!
    else rhs[r]! -= entries[e + 2]! * pinned[entries[e + 1]!]!
  }
  const factor = ldlFactor(matrix, ldlSymbolic(matrix, minimumDegreeOrdering(matrix)))
  ldlSolve(rhs, factor, rhs)
  const uv = pinned
  for (let d = 0; d < 2 * n; d++) if (dofIndex[d]! >= 0) uv[d] = rhs[dofIndex[d]!]!
  return rescaleToArea(uv, triangles, frames)
}

/** Scales uv about the origin so the flat area equals the 3D area (exact for a similarity). */
function rescaleToArea(
  uv: Float64Array,
  triangles: Readonly<Uint32Array>,
  frames: Readonly<TriangleFrames>,
): Float64Array {
  let flat = 0,
    spatial = 0
  for (let t = 0; t < triangles.length / 3; t++) {
    flat += signedArea(uv, triangles[3 * t]!, triangles[3 * t + 1]!, triangles[3 * t + 2]!)
    spatial += frames.areas[t]!
  }
  const s = flat > 0 ? Math.sqrt(spatial / flat) : 1
  for (let d = 0; d < uv.length; d++) uv[d]! *= s
  return uv
}

/** Signed area of flat triangle (a, b, c) in uv (#n×2), positive when counter-clockwise. */
export function signedArea(uv: Readonly<Float64Array>, a: number, b: number, c: number): number {
  return (
    0.5 *
    ((uv[2 * b]! - uv[2 * a]!) * (uv[2 * c + 1]! - uv[2 * a + 1]!) -
      (uv[2 * c]! - uv[2 * a]!) * (uv[2 * b + 1]! - uv[2 * a + 1]!))
  )
}
