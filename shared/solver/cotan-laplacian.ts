import type { TrianglePattern } from '../linalg/triangle-pattern'

/**
 * Per-corner cotan weights and areas of a 3D triangle mesh.
 * out: #T×3 Float64Array, entry 3t+k = ½cot of the angle at corner k (the weight of the opposite
 * edge); faceAreasOut: #T Float64Array, m². Returns the smallest face area (m²).
 */
export function cornerCotanWeights(
  out: Float64Array,
  faceAreasOut: Float64Array,
  vertices: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
): number {
  let smallest = Infinity
  for (let t = 0; t < triangles.length; t += 3) {
    const a = 3 * triangles[t]!,
      b = 3 * triangles[t + 1]!,
      c = 3 * triangles[t + 2]!
    const abx = vertices[b]! - vertices[a]!,
      aby = vertices[b + 1]! - vertices[a + 1]!,
      abz = vertices[b + 2]! - vertices[a + 2]!
    const acx = vertices[c]! - vertices[a]!,
      acy = vertices[c + 1]! - vertices[a + 1]!,
      acz = vertices[c + 2]! - vertices[a + 2]!
    const bcx = vertices[c]! - vertices[b]!,
      bcy = vertices[c + 1]! - vertices[b + 1]!,
      bcz = vertices[c + 2]! - vertices[b + 2]!
    const nx = aby * acz - abz * acy,
      ny = abz * acx - abx * acz,
      nz = abx * acy - aby * acx
    const twiceArea = Math.sqrt(nx * nx + ny * ny + nz * nz)
    faceAreasOut[t / 3] = twiceArea / 2
    smallest = Math.min(smallest, twiceArea / 2)
    // cot θ = (e1·e2)/|e1×e2|, and |e1×e2| is twice the area at every corner
    const s = twiceArea > 0 ? 0.5 / twiceArea : 0
    out[t] = s * (abx * acx + aby * acy + abz * acz)
    out[t + 1] = -s * (abx * bcx + aby * bcy + abz * bcz)
    out[t + 2] = s * (acx * bcx + acy * bcy + acz * bcz)
  }
  return smallest
}

/**
 * Writes σ × the cotan Laplacian (the stiffness whose x, y, z solves are the Pinkall–Polthier step)
 * on the free vertices into pattern.matrix.values and its coupling to fixed vertices into
 * rhs (#free×3, kN: σ·w·x_fixed). weights: from cornerCotanWeights; sigma: prestress, kN/m.
 */
export function assembleCotanLaplacian(
  pattern: TrianglePattern,
  rhs: Float64Array,
  weights: Readonly<Float64Array>,
  sigma: number,
  vertices: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
): void {
  const values = pattern.matrix.values
  const { freeIndex, triangleSlots } = pattern
  values.fill(0)
  rhs.fill(0)
  for (let t = 0; t < triangles.length; t += 3) {
    for (let k = 0; k < 3; k++) {
      // corner k weighs the edge (i, j) opposite to it
      const w = sigma * weights[t + k]!
      const a = (k + 1) % 3,
        b = (k + 2) % 3
      const i = triangles[t + a]!,
        j = triangles[t + b]!
      const fi = freeIndex[i]!,
        fj = freeIndex[j]!
      const base = 3 * t // 9 slots per triangle, t steps by 3
      if (fi >= 0) values[triangleSlots[base + 4 * a]!]! += w
      if (fj >= 0) values[triangleSlots[base + 4 * b]!]! += w
      if (fi >= 0 && fj >= 0) {
        values[triangleSlots[base + 3 * a + b]!]! -= w
        values[triangleSlots[base + 3 * b + a]!]! -= w
      } else if (fi >= 0) {
        for (let d = 0; d < 3; d++) rhs[3 * fi + d]! += w * vertices[3 * j + d]!
      } else if (fj >= 0) {
        for (let d = 0; d < 3; d++) rhs[3 * fj + d]! += w * vertices[3 * i + d]!
      }
    }
  }
}
