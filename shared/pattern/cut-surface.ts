/** Applying the seams one after another: each splits the current mesh and marks its edges. */
import { geodesicField } from './geodesic'
import { PatternError } from './pattern-error'
import { splitByLevelSet } from './split-level-set'
import type { PlaneSeam, Seam, TriangleMesh } from './types'

/** Values below this fraction of the surface's size count as on the plane (rounding, not geometry). */
const ON_PLANE = 1e-10

function boxDiagonal(vertices: Readonly<Float64Array>): number {
  const lo = [Infinity, Infinity, Infinity],
    hi = [-Infinity, -Infinity, -Infinity]
  for (let i = 0; i < vertices.length; i++) {
    lo[i % 3] = Math.min(lo[i % 3]!, vertices[i]!)
    hi[i % 3] = Math.max(hi[i % 3]!, vertices[i]!)
  }
  return Math.hypot(hi[0]! - lo[0]!, hi[1]! - lo[1]!, hi[2]! - lo[2]!)
}

/** Signed distance of each vertex to the plane (m), exactly 0 within rounding. */
export function planeField(vertices: Readonly<Float64Array>, seam: Readonly<PlaneSeam>): Float64Array {
  const [nx, ny, nz] = seam.normal
  const len = Math.hypot(nx, ny, nz)
  const tolerance = ON_PLANE * boxDiagonal(vertices)
  const phi = new Float64Array(vertices.length / 3)
  for (let v = 0; v < phi.length; v++) {
    const d =
      ((vertices[3 * v]! - seam.point[0]) * nx +
        (vertices[3 * v + 1]! - seam.point[1]) * ny +
        (vertices[3 * v + 2]! - seam.point[2]) * nz) /
      len
    phi[v] = Math.abs(d) <= tolerance ? 0 : d
  }
  return phi
}

/**
 * Splits the surface along every seam. Returns the split mesh and its seam edges (edge keys).
 * Throws PatternError naming `seams[i]` when a seam does not meet the surface or cannot be traced.
 */
export function cutSurface(
  surface: Readonly<TriangleMesh>,
  seams: readonly Seam[],
): { mesh: TriangleMesh; seamEdges: Set<number> } {
  let mesh: TriangleMesh = { vertices: surface.vertices, triangles: surface.triangles }
  const seamEdges = new Set<number>()
  seams.forEach((seam, i) => {
    const before = seamEdges.size
    if (seam.kind === 'plane') {
      mesh = splitByLevelSet(mesh, planeField(mesh.vertices, seam), null, seamEdges)
    } else {
      const { phi, active } = geodesicField(mesh, seam, `seams[${i}]`)
      mesh = splitByLevelSet(mesh, phi, active, seamEdges)
    }
    if (seamEdges.size === before)
      throw new PatternError('seam-misses-surface', 'this seam does not cross the surface', `seams[${i}]`)
  })
  return { mesh, seamEdges }
}
