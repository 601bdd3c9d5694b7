/**
 * Where each strip goes on a cutting drawing: strips side by side across the roll (v), each moved
 * so that its cut line starts at u = 0, with a gap between them. Metres.
 */
import type { StripPattern } from '../pattern/types'

export const LAYOUT_GAP = 0.3

export interface PlacedStrip {
  strip: StripPattern
  /** Add to (u, v) of the strip's points. */
  du: number
  dv: number
  /** Where the label and the warp arrow go (strip coordinates, already placed). */
  labelAt: [number, number]
}

/** Lays the strips out in order; returns them placed and the drawing's total size [u, v]. */
export function layoutStrips(
  strips: readonly StripPattern[],
  gap = LAYOUT_GAP,
): { placed: PlacedStrip[]; size: [number, number] } {
  const placed: PlacedStrip[] = []
  let v = 0,
    longest = 0
  for (const strip of strips) {
    const us = strip.cutLine.map((p) => p[0]),
      vs = strip.cutLine.map((p) => p[1])
    const u0 = Math.min(...us),
      v0 = Math.min(...vs),
      v1 = Math.max(...vs)
    const du = -u0,
      dv = v - v0
    // the outline's centroid-ish point: middle of the box, which lies inside for convex-ish strips
    const labelAt: [number, number] = [(Math.max(...us) - u0) / 2, v + (v1 - v0) / 2]
    placed.push({ strip, du, dv, labelAt })
    longest = Math.max(longest, Math.max(...us) - u0)
    v += v1 - v0 + gap
  }
  return { placed, size: [longest, Math.max(v - gap, 0)] }
}
