/**
 * Each 3D triangle in its own plane: corner a at (0, 0), b on the +x axis, c above it. The flat
 * pattern is compared against these local shapes (rotation-free, so only lengths and angles count).
 */
export interface TriangleFrames {
  /** #t×6 Float64Array: (x, y) of corners a, b, c in the triangle's plane, m (a = origin). */
  local: Float64Array
  /** #t×3 Float64Array: cot of the angle at each corner (the weight of the opposite edge). */
  cotangents: Float64Array
  /** #t Float64Array, m². */
  areas: Float64Array
  /** #t×6 Float64Array: the triangle's in-plane axes x̂ and ŷ in space (to carry the warp direction). */
  axes: Float64Array
}

/** vertices: #n×3 Float64Array (m); triangles: #t×3 Uint32Array. */
export function triangleFrames(vertices: Readonly<Float64Array>, triangles: Readonly<Uint32Array>): TriangleFrames {
  const count = triangles.length / 3
  const local = new Float64Array(6 * count)
  const cotangents = new Float64Array(3 * count)
  const areas = new Float64Array(count)
  const axes = new Float64Array(6 * count)
  for (let t = 0; t < count; t++) {
    const a = 3 * triangles[3 * t]!,
      b = 3 * triangles[3 * t + 1]!,
      c = 3 * triangles[3 * t + 2]!
    const e1 = [vertices[b]! - vertices[a]!, vertices[b + 1]! - vertices[a + 1]!, vertices[b + 2]! - vertices[a + 2]!]
    const e2 = [vertices[c]! - vertices[a]!, vertices[c + 1]! - vertices[a + 1]!, vertices[c + 2]! - vertices[a + 2]!]
    const l1 = Math.hypot(e1[0]!, e1[1]!, e1[2]!)
    const xh = e1.map((x) => x / (l1 || 1))
    const cx = e2[0]! * xh[0]! + e2[1]! * xh[1]! + e2[2]! * xh[2]!
    const perp = [e2[0]! - cx * xh[0]!, e2[1]! - cx * xh[1]!, e2[2]! - cx * xh[2]!]
    const cy = Math.hypot(perp[0]!, perp[1]!, perp[2]!)
    const yh = perp.map((x) => x / (cy || 1))
    local.set([0, 0, l1, 0, cx, cy], 6 * t)
    axes.set([xh[0]!, xh[1]!, xh[2]!, yh[0]!, yh[1]!, yh[2]!], 6 * t)
    const twiceArea = l1 * cy
    areas[t] = twiceArea / 2
    cornerCotangents(cotangents, 3 * t, local, 6 * t, twiceArea)
  }
  return { local, cotangents, areas, axes }
}

/**
 * cot of each corner of the 2D triangle p[o..o+6] into out[at..at+3]; cot θ = (e1·e2)/|e1×e2|.
 * A degenerate triangle (twiceArea 0) gets weight 0, so it neither pulls nor breaks the solve.
 */
export function cornerCotangents(
  out: Float64Array,
  at: number,
  p: Readonly<Float64Array>,
  o: number,
  twiceArea: number,
): void {
  for (let k = 0; k < 3; k++) {
    const i = o + 2 * k,
      j = o + 2 * ((k + 1) % 3),
      l = o + 2 * ((k + 2) % 3)
    const dot = (p[j]! - p[i]!) * (p[l]! - p[i]!) + (p[j + 1]! - p[i + 1]!) * (p[l + 1]! - p[i + 1]!)
    out[at + k] = twiceArea > 0 ? dot / twiceArea : 0
  }
}
