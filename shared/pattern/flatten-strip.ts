/** One strip laid flat: LSCM start, ARAP, then the warp/fill strain energy; warp turned onto +u. */
import { NotPositiveDefiniteError } from '../linalg'
import { arapRefine, SEAM_WEIGHT, strainRefine, type RefineOptions } from './local-global'
import { lscmFlatten } from './lscm'
import { edgeKey } from './mesh-edges'
import { PatternError } from './pattern-error'
import type { StripMesh } from './strips'
import { triangleFrames, type TriangleFrames } from './triangle-frames'
import { flatWarpAngle, warpInTriangles } from './warp-strain'

export interface FlattenOptions extends Partial<RefineOptions> {
  warpAngle: number
  warpCentre?: [number, number] | undefined
  /** Fabric stiffness along warp and fill (any unit, only the ratio counts); default equal. */
  stiffness?: { warp: number; fill: number } | undefined
}

export interface FlatStrip {
  /** #n×2 Float64Array, m, uncompensated; warp along +u. */
  uv: Float64Array
  frames: TriangleFrames
}

/** Two boundary vertices far apart (a double sweep: farthest from any, then farthest from that). */
function farPair(vertices: Readonly<Float64Array>, boundary: Readonly<Int32Array>): [number, number] {
  const farthest = (from: number): number => {
    let best = from,
      bestD = -1
    for (let e = 0; e < boundary.length; e++) {
      const v = boundary[e]!
      const d =
        (vertices[3 * v]! - vertices[3 * from]!) ** 2 +
        (vertices[3 * v + 1]! - vertices[3 * from + 1]!) ** 2 +
        (vertices[3 * v + 2]! - vertices[3 * from + 2]!) ** 2
      if (d > bestD) {
        bestD = d
        best = v
      }
    }
    return best
  }
  const a = farthest(boundary[0]!)
  return [a, farthest(a)]
}

/** k(θ)/L per triangle edge, halved on inner edges (two triangles carry them), raised on seams. */
function strainWeights(
  strip: Readonly<StripMesh>,
  frames: Readonly<TriangleFrames>,
  warp: Readonly<Float64Array>,
  stiffness: { warp: number; fill: number },
) {
  const { triangles } = strip
  const onBoundary = new Map<number, number>()
  for (let e = 0; e < strip.boundaryNeighbour.length; e++) {
    onBoundary.set(edgeKey(strip.boundaryEdges[2 * e]!, strip.boundaryEdges[2 * e + 1]!), strip.boundaryNeighbour[e]!)
  }
  const count = triangles.length / 3
  const weights = new Float64Array(3 * count)
  const rest = new Float64Array(3 * count)
  const x = frames.local
  for (let t = 0; t < count; t++) {
    const wx = warp[2 * t]!,
      wy = warp[2 * t + 1]!
    const wl = Math.hypot(wx, wy)
    for (let k = 0; k < 3; k++) {
      const i = (k + 1) % 3,
        j = (k + 2) % 3
      const ex = x[6 * t + 2 * j]! - x[6 * t + 2 * i]!,
        ey = x[6 * t + 2 * j + 1]! - x[6 * t + 2 * i + 1]!
      const len = Math.hypot(ex, ey)
      rest[3 * t + k] = len
      const cos2 = wl > 1e-6 && len > 0 ? ((ex * wx + ey * wy) / (len * wl)) ** 2 : 0.5
      const k0 = stiffness.warp * cos2 + stiffness.fill * (1 - cos2)
      const side = onBoundary.get(edgeKey(triangles[3 * t + i]!, triangles[3 * t + j]!))
      const share = side === undefined ? 0.5 : side >= 0 ? SEAM_WEIGHT : 1
      weights[3 * t + k] = len > 0 ? (k0 * share) / len : 0
    }
  }
  return { weights, rest }
}

/** Flattens one strip. Throws PatternError ('degenerate-strip', 'cancelled'). */
export function flattenStrip(strip: Readonly<StripMesh>, options: FlattenOptions, field: string): FlatStrip {
  const frames = triangleFrames(strip.vertices, strip.triangles)
  const refine: RefineOptions = {
    arapIterations: options.arapIterations ?? 20,
    strainIterations: options.strainIterations ?? 30,
    signal: options.signal,
  }
  const warp = warpInTriangles(frames, options.warpAngle, options.warpCentre, strip.vertices, strip.triangles)
  let uv: Float64Array
  try {
    const pins = farPair(strip.vertices, strip.boundaryEdges)
    uv = lscmFlatten(strip.vertices, strip.triangles, frames, strip.boundaryEdges, pins)
    arapRefine(uv, strip.triangles, frames, pins[0], refine)
    const { weights, rest } = strainWeights(strip, frames, warp, options.stiffness ?? { warp: 1, fill: 1 })
    strainRefine(uv, strip.triangles, rest, weights, pins[0], refine)
  } catch (err) {
    if (err instanceof NotPositiveDefiniteError)
      throw new PatternError(
        'degenerate-strip',
        'this strip has no area to lay flat (seams too close together?)',
        field,
      )
    throw err
  }
  const angle = flatWarpAngle(uv, strip.triangles, frames, warp)
  const c = Math.cos(-angle),
    s = Math.sin(-angle)
  for (let v = 0; v < uv.length; v += 2) {
    const u = uv[v]!,
      w = uv[v + 1]!
    uv[v] = c * u - s * w
    uv[v + 1] = s * u + c * w
  }
  return { uv, frames }
}
