import type { DofPattern } from '../linalg/dof-pattern'
import type { SymmetricCsr } from '../linalg/csr'

/**
 * Directions in which the spatial solver moves each free vertex. A membrane has no tangential
 * stiffness worth trusting in a discrete mesh (area minimisation slides vertices into slivers), so
 * interior vertices move along their normal only, and cable vertices along the normal and the
 * in-surface binormal (n × cable tangent); the mesh is kept regular by a separate tangential step.
 */

/** out: #V×3 area-weighted vertex normals (unit; zero where undefined). */
export function vertexNormals(
  out: Float64Array,
  vertices: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
): Float64Array {
  out.fill(0)
  for (let t = 0; t < triangles.length; t += 3) {
    const a = 3 * triangles[t]!,
      b = 3 * triangles[t + 1]!,
      c = 3 * triangles[t + 2]!
    const ux = vertices[b]! - vertices[a]!,
      uy = vertices[b + 1]! - vertices[a + 1]!,
      uz = vertices[b + 2]! - vertices[a + 2]!
    const vx = vertices[c]! - vertices[a]!,
      vy = vertices[c + 1]! - vertices[a + 1]!,
      vz = vertices[c + 2]! - vertices[a + 2]!
    const nx = uy * vz - uz * vy,
      ny = uz * vx - ux * vz,
      nz = ux * vy - uy * vx
    for (const p of [a, b, c]) {
      out[p]! += nx
      out[p + 1]! += ny
      out[p + 2]! += nz
    }
  }
  for (let p = 0; p < out.length; p += 3) {
    const len = Math.hypot(out[p]!, out[p + 1]!, out[p + 2]!)
    if (len > 0) for (let d = 0; d < 3; d++) out[p + d]! /= len
  }
  return out
}

/**
 * basis: #dofs×3, the unit direction of every unknown. Vertex rows follow `freeVertices` (the free
 * vertex of each row); cableNeighbours: #V×2, the two cable neighbours of a cable vertex or -1.
 */
export function fillBasis(
  basis: Float64Array,
  dofs: Readonly<DofPattern>,
  freeVertices: Readonly<Int32Array>,
  normals: Readonly<Float64Array>,
  cableNeighbours: Readonly<Int32Array>,
  vertices: Readonly<Float64Array>,
): void {
  for (let row = 0; row < freeVertices.length; row++) {
    const v = freeVertices[row]!
    const d0 = 3 * dofs.dofStart[row]!
    const nx = normals[3 * v]!,
      ny = normals[3 * v + 1]!,
      nz = normals[3 * v + 2]!
    basis[d0] = nx
    basis[d0 + 1] = ny
    basis[d0 + 2] = nz
    if (dofs.dofStart[row + 1]! - dofs.dofStart[row]! < 2) continue
    const a = 3 * cableNeighbours[2 * v]!,
      b = 3 * cableNeighbours[2 * v + 1]!
    const tx = vertices[b]! - vertices[a]!,
      ty = vertices[b + 1]! - vertices[a + 1]!,
      tz = vertices[b + 2]! - vertices[a + 2]!
    let bx = ny * tz - nz * ty,
      by = nz * tx - nx * tz,
      bz = nx * ty - ny * tx
    const len = Math.hypot(bx, by, bz) || 1
    bx /= len
    by /= len
    bz /= len
    basis[d0 + 3] = bx
    basis[d0 + 4] = by
    basis[d0 + 5] = bz
  }
}

/**
 * Projects the vertex stiffness K (scalar per vertex pair, acting on x, y, z alike) onto the chosen
 * directions: M = Bᵀ(K ⊗ I₃)B, written into dofs.matrix.values; rhs = Bᵀ·force (force #free×3).
 */
export function projectSystem(
  dofs: DofPattern,
  rhs: Float64Array,
  k: Readonly<SymmetricCsr>,
  basis: Readonly<Float64Array>,
  force: Readonly<Float64Array>,
): void {
  const { dofStart, slotOffset, matrix } = dofs
  const values = matrix.values
  for (let v = 0; v < k.n; v++) {
    const r0 = dofStart[v]!,
      r1 = dofStart[v + 1]!
    for (let a = r0; a < r1; a++) {
      rhs[a] =
        basis[3 * a]! * force[3 * v]! + basis[3 * a + 1]! * force[3 * v + 1]! + basis[3 * a + 2]! * force[3 * v + 2]!
      const rowBase = matrix.rowStart[a]!
      for (let s = k.rowStart[v]!; s < k.rowStart[v + 1]!; s++) {
        const u = k.columns[s]!
        const kvu = k.values[s]!
        const p = rowBase + slotOffset[s]!
        for (let b = dofStart[u]!; b < dofStart[u + 1]!; b++) {
          values[p + b - dofStart[u]!] =
            kvu *
            (basis[3 * a]! * basis[3 * b]! +
              basis[3 * a + 1]! * basis[3 * b + 1]! +
              basis[3 * a + 2]! * basis[3 * b + 2]!)
        }
      }
    }
  }
}
