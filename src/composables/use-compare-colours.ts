/**
 * Vertex colours for the comparison and report views: distance to the other surface, and slope.
 * Ramps are the workbench's own (src/lib/colour-maps.ts) plus one for distance.
 */
import { rampColour, SLOPE_RAMP, SLOPE_SPAN, srgbToLinear, type Stop } from '../lib/colour-maps'

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

/**
 * Slope of the surface at each vertex in degrees from horizontal: the area-weighted mean of the
 * adjacent faces' normals (cross products, which carry twice the face area), then the angle of
 * that normal from vertical. vertices: #V×3 m; triangles: #T×3. Returns Float64Array(#V), degrees.
 */
export function vertexSlopes(vertices: ArrayLike<number>, triangles: ArrayLike<number>): Float64Array {
  const nv = Math.floor(vertices.length / 3)
  const normals = new Float64Array(nv * 3)
  for (let t = 0; t + 2 < triangles.length; t += 3) {
    const a = triangles[t]!
    const b = triangles[t + 1]!
    const c = triangles[t + 2]!
    const ux = vertices[3 * b]! - vertices[3 * a]!
    const uy = vertices[3 * b + 1]! - vertices[3 * a + 1]!
    const uz = vertices[3 * b + 2]! - vertices[3 * a + 2]!
    const vx = vertices[3 * c]! - vertices[3 * a]!
    const vy = vertices[3 * c + 1]! - vertices[3 * a + 1]!
    const vz = vertices[3 * c + 2]! - vertices[3 * a + 2]!
    let nx = uy * vz - uz * vy
    let ny = uz * vx - ux * vz
    let nz = ux * vy - uy * vx
    // Orientation varies between meshers: point every face normal up before summing.
    if (nz < 0) [nx, ny, nz] = [-nx, -ny, -nz]
    for (const i of [a, b, c]) {
      normals[3 * i] = normals[3 * i]! + nx
      normals[3 * i + 1] = normals[3 * i + 1]! + ny
      normals[3 * i + 2] = normals[3 * i + 2]! + nz
    }
  }
  const out = new Float64Array(nv)
  for (let i = 0; i < nv; i++) {
    const len = Math.hypot(normals[3 * i]!, normals[3 * i + 1]!, normals[3 * i + 2]!)
    out[i] = len > 0 ? (Math.acos(Math.min(1, normals[3 * i + 2]! / len)) * 180) / Math.PI : 0
  }
  return out
}

/** Slope-map colours (flat = clay, steep = teal) like the workbench's slope view. */
export const slopeColours = (vertices: ArrayLike<number>, triangles: ArrayLike<number>): Float32Array =>
  rampColours(vertexSlopes(vertices, triangles), SLOPE_SPAN, SLOPE_RAMP)
