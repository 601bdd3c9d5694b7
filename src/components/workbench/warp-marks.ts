/**
 * Short strokes along the warp direction on the solved surface, for the viewport: the warp angle
 * in plan (degrees counter-clockwise from +x) projected vertically onto each marked face, as the
 * solver lays the prestress (shared/solver/membrane-fibres.ts). Faces standing steeper than about
 * 84° carry no stroke (the vertical projection is undefined there).
 */
import { faceCross, planDirectionRise } from '../../../shared/mesh/quantities'

/** Largest number of strokes drawn, so a fine mesh stays readable and cheap. */
export const MAX_WARP_MARKS = 400

/**
 * Stroke end points, #marks×2×3 Float32Array (m): one stroke through the centroid of every k-th
 * face, k chosen so at most MAX_WARP_MARKS are drawn, of length 0.8 × the face's size, lifted 1 %
 * of that along the face normal so it shows above the surface. vertices: #V×3; triangles: #T×3.
 */
export function warpMarks(vertices: ArrayLike<number>, triangles: ArrayLike<number>, warpAngle: number): Float32Array {
  const faces = triangles.length / 3
  const stride = Math.max(1, Math.ceil(faces / MAX_WARP_MARKS))
  const ax = Math.cos((warpAngle * Math.PI) / 180),
    ay = Math.sin((warpAngle * Math.PI) / 180)
  const out: number[] = []
  const cross = new Float64Array(3)
  for (let f = 0; f < faces; f += stride) {
    faceCross(vertices, triangles, f, cross, 0)
    const twice = Math.hypot(cross[0]!, cross[1]!, cross[2]!)
    if (twice === 0) continue
    const nx = cross[0]! / twice,
      ny = cross[1]! / twice,
      nz = cross[2]! / twice
    if (Math.abs(nz) < 0.1) continue
    const dz = planDirectionRise(nx, ny, nz, ax, ay)
    const length = Math.hypot(ax, ay, dz)
    const half = (0.4 * Math.sqrt(twice)) / length
    const lift = 0.01 * Math.sqrt(twice) * Math.sign(nz)
    const a = 3 * triangles[3 * f]!,
      b = 3 * triangles[3 * f + 1]!,
      c = 3 * triangles[3 * f + 2]!
    const cx = (vertices[a]! + vertices[b]! + vertices[c]!) / 3 + lift * nx,
      cy = (vertices[a + 1]! + vertices[b + 1]! + vertices[c + 1]!) / 3 + lift * ny,
      cz = (vertices[a + 2]! + vertices[b + 2]! + vertices[c + 2]!) / 3 + lift * nz
    out.push(cx - half * ax, cy - half * ay, cz - half * dz, cx + half * ax, cy + half * ay, cz + half * dz)
  }
  return Float32Array.from(out)
}
