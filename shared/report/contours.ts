/**
 * Height contours of a triangulated surface for the report's plan: marching triangles with linear
 * interpolation along edges, which is exact for the piecewise-linear surface the mesh describes.
 */

const NICE = [1, 2, 2.5, 5]
/** At most this many contour steps across the height range, so the plan stays legible on paper. */
const MAX_STEPS = 10

/**
 * A round contour interval (1, 2, 2.5 or 5 × 10^k m) giving at most 10 steps over [min, max];
 * null when the range is (numerically) flat, so no contours are drawn.
 */
export function contourInterval(min: number, max: number): number | null {
  const range = max - min
  if (!(range > 1e-6)) return null
  const raw = range / MAX_STEPS
  const exp = 10 ** Math.floor(Math.log10(raw))
  for (const f of NICE) if (f * exp >= raw * (1 - 1e-12)) return f * exp
  return 10 * exp
}

/** Multiples of `step` strictly between min and max (a level at an extreme would be a point). */
export function contourLevels(min: number, max: number, step: number): number[] {
  const out: number[] = []
  for (let k = Math.ceil(min / step); k * step <= max; k++) {
    const level = Number((k * step).toPrecision(12))
    if (level > min && level < max) out.push(level)
  }
  return out
}

/**
 * Segments of the contour z = level in plan, as [x1, y1, x2, y2, …] (m).
 * vertices: #V×3 (m); triangles: #T×3 indices. A vertex exactly at the level counts as above it,
 * so each crossed triangle yields exactly one segment and neighbours share its end points.
 */
export function contourSegments(vertices: ArrayLike<number>, triangles: ArrayLike<number>, level: number): number[] {
  const out: number[] = []
  const ends: number[] = []
  for (let t = 0; t + 2 < triangles.length; t += 3) {
    ends.length = 0
    for (let k = 0; k < 3; k++) {
      const p = 3 * triangles[t + k]!,
        q = 3 * triangles[t + ((k + 1) % 3)]!
      const zp = vertices[p + 2]!,
        zq = vertices[q + 2]!
      if (zp >= level === zq >= level) continue
      const s = (level - zp) / (zq - zp)
      ends.push(
        vertices[p]! + s * (vertices[q]! - vertices[p]!),
        vertices[p + 1]! + s * (vertices[q + 1]! - vertices[p + 1]!),
      )
    }
    if (ends.length === 4) out.push(ends[0]!, ends[1]!, ends[2]!, ends[3]!)
  }
  return out
}
