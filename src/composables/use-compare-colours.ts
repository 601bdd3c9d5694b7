/**
 * Vertex colours for the comparison and report views: distance to the other surface, and slope.
 * Ramps are the workbench's own (src/lib/colour-maps.ts) plus one for distance.
 */
import { rampColour, SLOPE_RAMP, SLOPE_SPAN, srgbToLinear, vertexSlopes, type Stop } from '../lib/colour-maps'

/** Unchanged (pale sand) through teal to moved far (clay); our own ramp. */
export const DISTANCE_RAMP: readonly Stop[] = [
  { at: 0, hex: '#f3ead8' },
  { at: 0.35, hex: '#6f9a86' },
  { at: 0.7, hex: '#2f5d62' },
  { at: 1, hex: '#b4553d' },
]

/**
 * A "nice" top of the distance legend: the largest distance rounded up to 1, 2 or 5 × 10^k metres,
 * at least 1 mm, so legends read 0 … 0.2 m rather than 0 … 0.1873 m.
 */
export function legendMax(distances: ArrayLike<number>): number {
  let top = 0
  for (let i = 0; i < distances.length; i++) {
    const d = distances[i]!
    if (Number.isFinite(d) && d > top) top = d
  }
  if (top <= 0.001) return 0.001
  const exp = 10 ** Math.floor(Math.log10(top))
  for (const f of [1, 2, 5, 10]) if (f * exp >= top - 1e-12) return f * exp
  return 10 * exp
}

/** Legend ticks 0, max/4, …, max in metres. */
export const legendTicks = (max: number): number[] => [0, 0.25, 0.5, 0.75, 1].map((f) => f * max)

/** Linear RGB per vertex (#V×3 Float32Array, three.js vertex colours) along `ramp` for values/max. */
export function rampColours(values: ArrayLike<number>, max: number, ramp: readonly Stop[]): Float32Array {
  const out = new Float32Array(values.length * 3)
  for (let i = 0; i < values.length; i++) {
    const [r, g, b] = rampColour(ramp, max > 0 ? values[i]! / max : 0)
    out[3 * i] = srgbToLinear(r)
    out[3 * i + 1] = srgbToLinear(g)
    out[3 * i + 2] = srgbToLinear(b)
  }
  return out
}

/** Slope-map colours (flat = clay, steep = teal) like the workbench's slope view. */
export const slopeColours = (vertices: ArrayLike<number>, triangles: ArrayLike<number>): Float32Array =>
  rampColours(vertexSlopes(new Float64Array(vertices.length / 3), vertices, triangles), SLOPE_SPAN, SLOPE_RAMP)
