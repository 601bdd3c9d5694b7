/**
 * How two frame loops sit relative to each other in plan, and whether they are apart in height.
 * Used by validation (hole inside outer, holes apart) and by frame classification (spatial).
 */
import type { FrameLoop } from '../types'
import { pointInLoop, segmentsTouch } from '../mesh/plan-geometry'

/** #n×2 plan coordinates of a loop, metres. */
export function loopPlan(loop: Readonly<FrameLoop>): Float64Array {
  const xy = new Float64Array(2 * loop.points.length)
  loop.points.forEach((p, i) => {
    xy[2 * i] = p.x
    xy[2 * i + 1] = p.y
  })
  return xy
}

/** First pair of touching edges [edge of a, edge of b] between two different loops, or null. */
export function loopsTouch(a: Readonly<Float64Array>, b: Readonly<Float64Array>, tol: number): [number, number] | null {
  const na = a.length / 2,
    nb = b.length / 2
  for (let i = 0; i < na; i++) {
    const i2 = (i + 1) % na
    const ax0 = Math.min(a[2 * i]!, a[2 * i2]!) - tol,
      ax1 = Math.max(a[2 * i]!, a[2 * i2]!) + tol
    const ay0 = Math.min(a[2 * i + 1]!, a[2 * i2 + 1]!) - tol,
      ay1 = Math.max(a[2 * i + 1]!, a[2 * i2 + 1]!) + tol
    for (let j = 0; j < nb; j++) {
      const j2 = (j + 1) % nb
      if (Math.max(b[2 * j]!, b[2 * j2]!) < ax0 || Math.min(b[2 * j]!, b[2 * j2]!) > ax1) continue
      if (Math.max(b[2 * j + 1]!, b[2 * j2 + 1]!) < ay0 || Math.min(b[2 * j + 1]!, b[2 * j2 + 1]!) > ay1) continue
      if (
        segmentsTouch(
          a[2 * i]!,
          a[2 * i + 1]!,
          a[2 * i2]!,
          a[2 * i2 + 1]!,
          b[2 * j]!,
          b[2 * j + 1]!,
          b[2 * j2]!,
          b[2 * j2 + 1]!,
          tol,
        )
      ) {
        return [i, j]
      }
    }
  }
  return null
}

/** Is every point of `inner` strictly inside `outer` and no edges touch? */
export function loopStrictlyInside(inner: Readonly<Float64Array>, outer: Readonly<Float64Array>, tol: number): boolean {
  for (let i = 0; i < inner.length; i += 2) if (!pointInLoop(inner[i]!, inner[i + 1]!, outer)) return false
  return loopsTouch(inner, outer, tol) === null
}

/** Are the height ranges of the two loops disjoint by more than tol (m)? Then no 3D crossing exists. */
export function loopsApartInHeight(a: Readonly<FrameLoop>, b: Readonly<FrameLoop>, tol: number): boolean {
  const za = a.points.map((p) => p.z),
    zb = b.points.map((p) => p.z)
  return Math.min(...za) > Math.max(...zb) + tol || Math.min(...zb) > Math.max(...za) + tol
}

/** Plan span of a frame (bounding-box diagonal), m; sets the scale of length tolerances. */
export function frameSpan(loops: readonly Readonly<FrameLoop>[]): number {
  let minX = Infinity,
    minY = Infinity,
    minZ = Infinity,
    maxX = -Infinity,
    maxY = -Infinity,
    maxZ = -Infinity
  for (const l of loops) {
    for (const p of l.points) {
      minX = Math.min(minX, p.x)
      maxX = Math.max(maxX, p.x)
      minY = Math.min(minY, p.y)
      maxY = Math.max(maxY, p.y)
      minZ = Math.min(minZ, p.z)
      maxZ = Math.max(maxZ, p.z)
    }
  }
  return Math.hypot(maxX - minX, maxY - minY, maxZ - minZ)
}
