/**
 * Picking math for the viewport, free of three.js so it can be unit-tested. Screen-space picking
 * (pixels) is used for handles and edges because it behaves the same in the plan and 3D cameras
 * and does not depend on how large a handle happens to be drawn.
 */

type Vec3 = Readonly<{ x: number; y: number; z: number }>
type Vec2 = Readonly<{ x: number; y: number }>

/** Rays closer than this to parallel with the plane (|dz|) are treated as missing it. */
const PARALLEL_EPSILON = 1e-9

/**
 * Where a ray (origin + t·direction, t ≥ 0) meets the horizontal plane at height z (m).
 * Returns null when the ray runs parallel to the plane or points away from it.
 */
export function rayPlaneZ(origin: Vec3, direction: Vec3, z: number): { x: number; y: number } | null {
  if (Math.abs(direction.z) < PARALLEL_EPSILON) return null
  const t = (z - origin.z) / direction.z
  if (t < 0) return null
  return { x: origin.x + t * direction.x, y: origin.y + t * direction.y }
}

/** The nearest of `points` to `p` (pixels) within `maxDistance`, or null. */
export function nearestPoint2D(
  p: Vec2,
  points: readonly Vec2[],
  maxDistance: number,
): { index: number; distance: number } | null {
  let best: { index: number; distance: number } | null = null
  points.forEach((q, index) => {
    const distance = Math.hypot(q.x - p.x, q.y - p.y)
    if (distance <= maxDistance && (!best || distance < best.distance)) best = { index, distance }
  })
  return best
}

/**
 * The nearest segment a→b to `p` within `maxDistance`, with t in [0, 1] the parameter of the
 * closest point along it (so a new point can be placed at a + t·(b − a) in 3D).
 */
export function nearestSegment2D(
  p: Vec2,
  segments: readonly { a: Vec2; b: Vec2 }[],
  maxDistance: number,
): { index: number; t: number; distance: number } | null {
  let best: { index: number; t: number; distance: number } | null = null
  segments.forEach(({ a, b }, index) => {
    const dx = b.x - a.x
    const dy = b.y - a.y
    const len2 = dx * dx + dy * dy
    const t = len2 > 0 ? Math.min(1, Math.max(0, ((p.x - a.x) * dx + (p.y - a.y) * dy) / len2)) : 0
    const distance = Math.hypot(a.x + t * dx - p.x, a.y + t * dy - p.y)
    if (distance <= maxDistance && (!best || distance < best.distance)) best = { index, t, distance }
  })
  return best
}

/**
 * A small hole ring (mast ring, oculus) of `count` points around a plan centre at height z, in
 * the same turning sense as the starter frames' holes (clockwise seen from above).
 */
export function holeRing(center: Vec2, radius: number, z: number, count = 8): { x: number; y: number; z: number }[] {
  const tidy = (v: number): number => Math.round(v * 1000) / 1000
  return Array.from({ length: count }, (_, i) => {
    const a = (-2 * Math.PI * i) / count
    return { x: tidy(center.x + radius * Math.cos(a)), y: tidy(center.y + radius * Math.sin(a)), z }
  })
}
