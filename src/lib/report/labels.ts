/**
 * Placing text on the report's drawings so it stays readable: frame point labels pushed out from
 * their loop's centre (far enough that a small mast ring's labels do not overlap), and contour
 * labels put where they are furthest from every other label. Coordinates in SVG units.
 */
import type { SvgLabel } from './views'

/** A frame point label with a leader line when it had to move away from its point. */
export interface PointLabel {
  x: number
  y: number
  label: SvgLabel
  leader: string | null
}

/** Width of a short label such as "H1 P10" at the drawings' 10-unit font, plus a gap. */
const LABEL_WIDTH = 38
const OFFSET = 12

/**
 * Labels for one loop's points at (xs[i], ys[i]): along the ray from the loop's centre through each
 * point, at least 12 units past the point and, for loops with many points, on a circle wide enough
 * to give each label its width.
 */
export function loopPointLabels(xs: readonly number[], ys: readonly number[], texts: readonly string[]): PointLabel[] {
  const n = xs.length
  const cx = xs.reduce((s, v) => s + v, 0) / n,
    cy = ys.reduce((s, v) => s + v, 0) / n
  const ring = (n * LABEL_WIDTH) / (2 * Math.PI)
  return xs.map((x, i) => {
    const y = ys[i]!
    const d = Math.hypot(x - cx, y - cy)
    const ux = d > 0 ? (x - cx) / d : 0,
      uy = d > 0 ? (y - cy) / d : -1
    const r = Math.max(d + OFFSET, ring)
    const lx = cx + ux * r,
      ly = cy + uy * r
    const anchor = ux > 0.35 ? 'start' : ux < -0.35 ? 'end' : 'middle'
    const label: SvgLabel = { x: lx, y: ly + (uy > 0.35 ? 8 : uy < -0.35 ? 0 : 4), text: texts[i]!, anchor }
    const leader =
      r - d > OFFSET + 4
        ? `M${(x + ux * 3).toFixed(1)} ${(y + uy * 3).toFixed(1)}L${(lx - ux * 3).toFixed(1)} ${(ly - uy * 3).toFixed(1)}`
        : null
    return { x, y, label, leader }
  })
}

/**
 * Picks one place per contour among candidate points (segment mid-points), each as far as possible
 * from the labels already placed; `taken` holds their positions and grows as labels are placed.
 */
export function spreadLabels(
  candidates: readonly (readonly [number, number])[][],
  taken: [number, number][],
): ([number, number] | null)[] {
  return candidates.map((list) => {
    let best: [number, number] | null = null,
      score = -1
    for (const [x, y] of list) {
      let near = Infinity
      for (const [tx, ty] of taken) near = Math.min(near, Math.hypot(x - tx, (y - ty) * 2))
      if (near > score) [best, score] = [[x, y], near]
    }
    if (best) taken.push(best)
    return best
  })
}

/**
 * Pin discs numbered 1, 2, … at their plan positions; a disc that would cover an earlier one moves
 * round it on a widening circle and keeps a leader line to its point, so every number stays legible.
 */
export function spreadPins(at: [number, number][]): { x: number; y: number; text: string; leader: string | null }[] {
  const placed: [number, number][] = []
  return at.map(([x0, y0], i) => {
    let [x, y] = [x0, y0]
    for (let k = 0; placed.some(([px, py]) => Math.hypot(px - x, py - y) < 17); k++) {
      const r = 18 * (1 + Math.floor(k / 6)),
        a = (k * Math.PI) / 3 - Math.PI / 4
      ;[x, y] = [x0 + r * Math.cos(a), y0 + r * Math.sin(a)]
    }
    placed.push([x, y])
    const leader = x !== x0 || y !== y0 ? `M${x0.toFixed(1)} ${y0.toFixed(1)}L${x.toFixed(1)} ${y.toFixed(1)}` : null
    return { x, y, text: String(i + 1), leader }
  })
}
