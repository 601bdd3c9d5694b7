/**
 * Plan (xy) geometry of frame loops: signed areas, point-in-loop, segment crossings.
 * Loops are given as flat #n×2 arrays of plan coordinates in metres, closed implicitly.
 */
/** Signed plan area of a closed loop (shoelace), m²: positive when counter-clockwise. */
export function loopSignedArea(xy: Readonly<ArrayLike<number>>): number {
  const n = xy.length / 2
  let a = 0
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n
    a += xy[2 * i]! * xy[2 * j + 1]! - xy[2 * j]! * xy[2 * i + 1]!
  }
  return a / 2
}

/** Even–odd test: is (x, y) strictly inside the closed loop? Points on the loop give either answer. */
export function pointInLoop(x: number, y: number, xy: Readonly<ArrayLike<number>>): boolean {
  const n = xy.length / 2
  let inside = false
  for (let i = 0, j = n - 1; i < n; j = i++) {
    const xi = xy[2 * i]!,
      yi = xy[2 * i + 1]!,
      xj = xy[2 * j]!,
      yj = xy[2 * j + 1]!
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside
  }
  return inside
}

/** Orientation of c relative to the line a→b: twice the signed triangle area. */
export function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  return (bx - ax) * (cy - ay) - (by - ay) * (cx - ax)
}

/**
 * Do the closed segments p1p2 and q1q2 touch or cross? `tol` is an absolute length (m) below which
 * a point counts as lying on a segment.
 */
export function segmentsTouch(
  p1x: number,
  p1y: number,
  p2x: number,
  p2y: number,
  q1x: number,
  q1y: number,
  q2x: number,
  q2y: number,
  tol: number,
): boolean {
  const lp = Math.hypot(p2x - p1x, p2y - p1y)
  // Signed distances to the other segment's line; a zero-length segment gives 0 (orient is 0 too).
  const lq = Math.hypot(q2x - q1x, q2y - q1y)
  const d1 = orient(q1x, q1y, q2x, q2y, p1x, p1y) / (lq || 1)
  const d2 = orient(q1x, q1y, q2x, q2y, p2x, p2y) / (lq || 1)
  const d3 = orient(p1x, p1y, p2x, p2y, q1x, q1y) / (lp || 1)
  const d4 = orient(p1x, p1y, p2x, p2y, q2x, q2y) / (lp || 1)
  if (((d1 > tol && d2 < -tol) || (d1 < -tol && d2 > tol)) && ((d3 > tol && d4 < -tol) || (d3 < -tol && d4 > tol))) {
    return true
  }
  return (
    pointSegmentDistance(p1x, p1y, q1x, q1y, q2x, q2y) <= tol ||
    pointSegmentDistance(p2x, p2y, q1x, q1y, q2x, q2y) <= tol ||
    pointSegmentDistance(q1x, q1y, p1x, p1y, p2x, p2y) <= tol ||
    pointSegmentDistance(q2x, q2y, p1x, p1y, p2x, p2y) <= tol
  )
}

/** Distance from (px, py) to the closed segment ab, m. */
export function pointSegmentDistance(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax,
    dy = by - ay
  const l2 = dx * dx + dy * dy
  let t = l2 > 0 ? ((px - ax) * dx + (py - ay) * dy) / l2 : 0
  t = t < 0 ? 0 : t > 1 ? 1 : t
  return Math.hypot(px - ax - t * dx, py - ay - t * dy)
}
