import { EPSILON } from '../linalg/constants'
import { csrSlot, type SymmetricCsr } from '../linalg/csr'
import type { TrianglePattern } from '../linalg/triangle-pattern'
import { assembleCotanLaplacian, cornerCotanWeights } from './cotan-laplacian'
import type { SpdSystem } from './spd-system'

/** Slots (i,i), (j,j), (i,j), (j,i) of each cable segment (#S×2 vertex pairs), -1 where fixed. */
export function cableSlots(pattern: TrianglePattern, segments: Readonly<Uint32Array>): Int32Array {
  const { matrix, freeIndex } = pattern
  const slots = new Int32Array(2 * segments.length).fill(-1)
  for (let s = 0; s < segments.length / 2; s++) {
    const fi = freeIndex[segments[2 * s]!]!,
      fj = freeIndex[segments[2 * s + 1]!]!
    if (fi >= 0) slots[4 * s] = matrix.diagonal[fi]!
    if (fj >= 0) slots[4 * s + 1] = matrix.diagonal[fj]!
    if (fi >= 0 && fj >= 0) {
      slots[4 * s + 2] = csrSlot(matrix, fi, fj)
      slots[4 * s + 3] = csrSlot(matrix, fj, fi)
      if (slots[4 * s + 2]! < 0) throw new Error(`cable segment ${s} is not a mesh edge`)
    }
  }
  return slots
}

/**
 * Adds the cable force densities q = T/l (kN/m, current lengths) to the vertex stiffness and the
 * fixed-vertex coupling to rhs (#free×3). segments: #S×2; tensions: #S, kN; x: #V×3, m.
 */
export function addCables(
  pattern: TrianglePattern,
  rhs: Float64Array,
  slots: Readonly<Int32Array>,
  segments: Readonly<Uint32Array>,
  tensions: Readonly<Float64Array>,
  x: Readonly<Float64Array>,
): void {
  const values = pattern.matrix.values
  const { freeIndex } = pattern
  for (let s = 0; s < segments.length / 2; s++) {
    const i = segments[2 * s]!,
      j = segments[2 * s + 1]!
    const length = Math.hypot(x[3 * j]! - x[3 * i]!, x[3 * j + 1]! - x[3 * i + 1]!, x[3 * j + 2]! - x[3 * i + 2]!)
    const q = tensions[s]! / Math.max(length, EPSILON)
    const fi = freeIndex[i]!,
      fj = freeIndex[j]!
    if (fi >= 0) values[slots[4 * s]!]! += q
    if (fj >= 0) values[slots[4 * s + 1]!]! += q
    if (fi >= 0 && fj >= 0) {
      values[slots[4 * s + 2]!]! -= q
      values[slots[4 * s + 3]!]! -= q
    } else if (fi >= 0) {
      for (let d = 0; d < 3; d++) rhs[3 * fi + d]! += q * x[3 * j + d]!
    } else if (fj >= 0) {
      for (let d = 0; d < 3; d++) rhs[3 * fj + d]! += q * x[3 * i + d]!
    }
  }
}

/** force −= K·x on the free rows (force, #free×3; K acts on x, y, z alike): the nodal forces, kN. */
export function subtractProduct(
  force: Float64Array,
  k: Readonly<SymmetricCsr>,
  x: Readonly<Float64Array>,
  freeVertices: Readonly<Int32Array>,
): void {
  for (let i = 0; i < k.n; i++) {
    for (let p = k.rowStart[i]!; p < k.rowStart[i + 1]!; p++) {
      const c = 3 * freeVertices[k.columns[p]!]!
      const a = k.values[p]!
      force[3 * i]! -= a * x[c]!
      force[3 * i + 1]! -= a * x[c + 1]!
      force[3 * i + 2]! -= a * x[c + 2]!
    }
  }
}

/**
 * Harmonic map of the current boundary on the given surface's metric (#V×3 out): where interior
 * vertices would sit if the mesh kept its parametrisation. The regulariser holds every boundary
 * vertex; its matrix (cotan weights of `metric`) is assembled and factored once per solve.
 */
export function harmonicTarget(
  out: Float64Array,
  regulariser: SpdSystem,
  metric: Readonly<Float64Array>,
  boundary: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  weights?: Float64Array,
): Float64Array {
  const pattern = regulariser.pattern
  const n = pattern.matrix.n
  const w = weights ?? new Float64Array(triangles.length)
  if (!weights) cornerCotanWeights(w, new Float64Array(triangles.length / 3), metric, triangles)
  const rhs = new Float64Array(3 * n)
  assembleCotanLaplacian(pattern, rhs, w, 1, boundary, triangles)
  const b = new Float64Array(n)
  const y = new Float64Array(n)
  out.set(boundary)
  for (let d = 0; d < 3; d++) {
    for (let i = 0; i < n; i++) b[i] = rhs[3 * i + d]!
    regulariser.solve(y, b, 1e-12, 5)
    for (let v = 0; v < pattern.freeIndex.length; v++) {
      const f = pattern.freeIndex[v]!
      if (f >= 0) out[3 * v + d] = y[f]!
    }
  }
  return out
}

/** x_i += (I − n nᵀ)(target_i − x_i) for the vertices the regulariser leaves free (interior ones). */
export function slideTangentially(
  x: Float64Array,
  target: Readonly<Float64Array>,
  normals: Readonly<Float64Array>,
  freeIndex: Readonly<Int32Array>,
): void {
  for (let v = 0; v < freeIndex.length; v++) {
    if (freeIndex[v]! < 0) continue
    const p = 3 * v
    const dx = target[p]! - x[p]!,
      dy = target[p + 1]! - x[p + 1]!,
      dz = target[p + 2]! - x[p + 2]!
    const along = dx * normals[p]! + dy * normals[p + 1]! + dz * normals[p + 2]!
    x[p]! += dx - along * normals[p]!
    x[p + 1]! += dy - along * normals[p + 1]!
    x[p + 2]! += dz - along * normals[p + 2]!
  }
}

/** Max over free rows of |projected force| / (σ · vertex area) × scale. */
export function projectedResidual(
  rhs: Readonly<Float64Array>,
  dofStart: Readonly<Int32Array>,
  freeVertices: Readonly<Int32Array>,
  vertexAreas: Readonly<Float64Array>,
  sigma: number,
  scale: number,
): number {
  let worst = 0
  for (let row = 0; row < freeVertices.length; row++) {
    let sum = 0
    for (let a = dofStart[row]!; a < dofStart[row + 1]!; a++) sum += rhs[a]! * rhs[a]!
    const r = Math.sqrt(sum) / (sigma * vertexAreas[freeVertices[row]!]!)
    if (!(r <= worst)) worst = r
  }
  return worst * scale
}
