/**
 * The warp direction on the surface and in the flat strip, and the strain of the flat strip
 * against the 3D strip. For each triangle F maps flat vectors to vectors in the 3D triangle's
 * plane (F = X·U⁻¹, X and U the 2×2 edge matrices); strain along a flat unit vector d is |F d| − 1
 * (positive: the surface is longer than the cloth, the cloth is stretched when installed).
 */
import type { TriangleFrames } from './triangle-frames'

/**
 * #t×2 Float64Array: the plan warp direction projected into each triangle's plane (local axes),
 * not normalised. centre: when given, the plan direction points away from it (radial warp), and
 * `positions` (#n×3) with `triangles` place each triangle.
 */
export function warpInTriangles(
  frames: Readonly<TriangleFrames>,
  warpAngleDegrees: number,
  centre?: readonly [number, number],
  positions?: Readonly<Float64Array>,
  triangles?: Readonly<Uint32Array>,
): Float64Array {
  const count = frames.areas.length
  let wx = Math.cos((warpAngleDegrees * Math.PI) / 180),
    wy = Math.sin((warpAngleDegrees * Math.PI) / 180)
  const out = new Float64Array(2 * count)
  for (let t = 0; t < count; t++) {
    if (centre && positions && triangles) {
      let x = 0,
        y = 0
      for (let k = 0; k < 3; k++) {
        x += positions[3 * triangles[3 * t + k]!]! / 3
        y += positions[3 * triangles[3 * t + k]! + 1]! / 3
      }
      const len = Math.hypot(x - centre[0], y - centre[1]) || 1
      wx = (x - centre[0]) / len
      wy = (y - centre[1]) / len
    }
    const ax = frames.axes
    out[2 * t] = ax[6 * t]! * wx + ax[6 * t + 1]! * wy
    out[2 * t + 1] = ax[6 * t + 3]! * wx + ax[6 * t + 4]! * wy
  }
  return out
}

/** The 2×2 map flat → local 3D of triangle t as [a, b, c, d] (row-major), or null if degenerate. */
function flatToSurface(
  uv: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  frames: Readonly<TriangleFrames>,
  t: number,
): number[] | null {
  const i = triangles[3 * t]!,
    j = triangles[3 * t + 1]!,
    k = triangles[3 * t + 2]!
  const u1 = uv[2 * j]! - uv[2 * i]!,
    v1 = uv[2 * j + 1]! - uv[2 * i + 1]!
  const u2 = uv[2 * k]! - uv[2 * i]!,
    v2 = uv[2 * k + 1]! - uv[2 * i + 1]!
  const det = u1 * v2 - u2 * v1
  if (Math.abs(det) < 1e-300) return null
  const x = frames.local
  const x1 = x[6 * t + 2]!,
    y1 = x[6 * t + 3]!,
    x2 = x[6 * t + 4]!,
    y2 = x[6 * t + 5]!
  // X = [x1 x2; y1 y2], U⁻¹ = [v2 −u2; −v1 u1]/det
  return [(x1 * v2 - x2 * v1) / det, (x2 * u1 - x1 * u2) / det, (y1 * v2 - y2 * v1) / det, (y2 * u1 - y1 * u2) / det]
}

/**
 * The mean warp angle in the flat strip (radians), area- and projection-weighted, averaged as an
 * axis (doubled angles), so that rotating by its negative lays the warp along +u.
 */
export function flatWarpAngle(
  uv: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  frames: Readonly<TriangleFrames>,
  warp: Readonly<Float64Array>,
): number {
  let c2 = 0,
    s2 = 0
  for (let t = 0; t < frames.areas.length; t++) {
    const f = flatToSurface(uv, triangles, frames, t)
    if (!f) continue
    // flat image of the surface warp: F⁻¹ w
    const det = f[0]! * f[3]! - f[1]! * f[2]!
    const wx = warp[2 * t]!,
      wy = warp[2 * t + 1]!
    const fu = (f[3]! * wx - f[1]! * wy) / det,
      fv = (-f[2]! * wx + f[0]! * wy) / det
    const len2 = fu * fu + fv * fv
    if (!(len2 > 0)) continue
    // weight: area × |projected warp|² (a triangle nearly across the warp says little)
    const w = (frames.areas[t]! * (wx * wx + wy * wy)) / len2
    c2 += w * (fu * fu - fv * fv)
    s2 += w * 2 * fu * fv
  }
  return 0.5 * Math.atan2(s2, c2)
}

export interface StrainSummary {
  maxWarp: number
  maxFill: number
  rms: number
  /** #t×2: warp and fill strain per triangle (for colouring). */
  perTriangle: Float64Array
}

/** Strain with warp along +u and fill along +v (uv already rotated). */
export function strainSummary(
  uv: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  frames: Readonly<TriangleFrames>,
): StrainSummary {
  const count = frames.areas.length
  const perTriangle = new Float64Array(2 * count)
  let maxWarp = 0,
    maxFill = 0,
    sum = 0,
    area = 0
  for (let t = 0; t < count; t++) {
    const f = flatToSurface(uv, triangles, frames, t)
    if (!f) continue
    const ew = Math.hypot(f[0]!, f[2]!) - 1
    const ef = Math.hypot(f[1]!, f[3]!) - 1
    perTriangle[2 * t] = ew
    perTriangle[2 * t + 1] = ef
    maxWarp = Math.max(maxWarp, Math.abs(ew))
    maxFill = Math.max(maxFill, Math.abs(ef))
    // principal stretches: singular values of F as (|rotation part| ± |reflection part|)/2, no cancellation
    const p = Math.hypot(f[0]! + f[3]!, f[2]! - f[1]!) / 2,
      q = Math.hypot(f[0]! - f[3]!, f[2]! + f[1]!) / 2
    const s1 = p + q,
      s2 = Math.abs(p - q)
    sum += (frames.areas[t]! * ((s1 - 1) ** 2 + (s2 - 1) ** 2)) / 2
    area += frames.areas[t]!
  }
  return { maxWarp, maxFill, rms: area > 0 ? Math.sqrt(sum / area) : 0, perTriangle }
}
