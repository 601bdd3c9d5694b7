/** Face slopes and their area-weighted distribution. */
import type { Histogram } from '../types'

/** Slope of each face from horizontal, degrees: out #T, from unit normals #T×3 (|n_z| = cos slope). */
export function faceSlopes(out: Float64Array, normals: Readonly<Float64Array>): Float64Array {
  for (let t = 0; t < out.length; t++) {
    const nz = Math.min(1, Math.abs(normals[3 * t + 2]!))
    out[t] = (Math.acos(nz) * 180) / Math.PI
  }
  return out
}

/** Area-weighted histogram of slopes (degrees) over [0, 90] in `bins` equal bins; shares sum to 1. */
export function slopeHistogram(slopes: Readonly<Float64Array>, areas: Readonly<Float64Array>, bins: number): Histogram {
  const edges = Array.from({ length: bins + 1 }, (_, i) => (90 * i) / bins)
  const shares = new Array<number>(bins).fill(0)
  let total = 0
  for (let t = 0; t < slopes.length; t++) {
    const b = Math.min(bins - 1, Math.floor((slopes[t]! / 90) * bins))
    shares[b]! += areas[t]!
    total += areas[t]!
  }
  return { edges, shares: shares.map((s) => (total > 0 ? s / total : 0)) }
}

/** Share of area (0..1) whose slope is below `threshold` degrees. */
export function flatAreaShare(
  slopes: Readonly<Float64Array>,
  areas: Readonly<Float64Array>,
  threshold: number,
): number {
  let flat = 0,
    total = 0
  for (let t = 0; t < slopes.length; t++) {
    total += areas[t]!
    if (slopes[t]! < threshold) flat += areas[t]!
  }
  return total > 0 ? flat / total : 0
}
