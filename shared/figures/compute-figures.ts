/**
 * The figures of a solved surface (PRODUCT.md "figures"; Figures in types.ts). Pure function of the
 * solved mesh and its frame. Lengths m, areas m², angles degrees, forces kN.
 */
import type { Figures, Frame, MembraneMesh } from '../types'
import { faceAreas, faceNormals, planFaceAreas, vertexAngleDefects } from '../mesh/quantities'
import { buildVertexNeighbours } from '../mesh/smoothing'
import { cableFigures, frameReactions } from './boundary-forces'
import { pondingPockets } from './ponding'
import { faceSlopes, flatAreaShare, slopeHistogram } from './slopes'

/**
 * Common practice: membrane design guides commonly ask for a minimum slope of about 5° so rain
 * runs off and the fabric does not flutter; faces flatter than this count as flat.
 */
export const DEFAULT_FLAT_THRESHOLD = 5
const HISTOGRAM_BINS = 18
/** Angle defects within this many radians of zero count as flat (round-off), not anticlastic. */
const DEFECT_TOLERANCE = 1e-9

export interface FigureOptions {
  /** Slope in degrees below which a face counts as flat (default 5°, common practice). */
  flatThreshold?: number
  /** Solver residual to pass through (dimensionless); 0 when not given. */
  residual?: number
  /** Pockets shallower than this (m) are ignored; default 1e-6 × frame span. */
  minPondingDepth?: number
}

/** Compute all figures. mesh.vertices must hold the solved positions (#V×3, m). */
export function computeFigures(
  mesh: Readonly<MembraneMesh>,
  frame: Readonly<Frame>,
  options: FigureOptions = {},
): Figures {
  const V = mesh.vertices,
    T = mesh.triangles
  const nV = V.length / 3,
    nT = T.length / 3
  const areas = faceAreas(new Float64Array(nT), V, T)
  const plans = planFaceAreas(new Float64Array(nT), V, T)
  const normals = faceNormals(new Float64Array(3 * nT), V, T)
  const slopes = faceSlopes(new Float64Array(nT), normals)
  const isBoundary = new Uint8Array(nV)
  for (let v = 0; v < nV; v++) isBoundary[v] = mesh.vertexLoops[v]! >= 0 ? 1 : 0

  let area = 0,
    planArea = 0
  const vertexAreas = new Float64Array(nV),
    vertexPlanAreas = new Float64Array(nV)
  for (let t = 0; t < nT; t++) {
    area += areas[t]!
    planArea += Math.abs(plans[t]!)
    for (let k = 0; k < 3; k++) {
      vertexAreas[T[3 * t + k]!]! += areas[t]! / 3
      vertexPlanAreas[T[3 * t + k]!]! += Math.abs(plans[t]!) / 3
    }
  }
  let zMin = Infinity,
    zMax = -Infinity
  for (let v = 0; v < nV; v++) {
    zMin = Math.min(zMin, V[3 * v + 2]!)
    zMax = Math.max(zMax, V[3 * v + 2]!)
  }
  let sMin = Infinity,
    sMax = -Infinity
  for (let t = 0; t < nT; t++) {
    sMin = Math.min(sMin, slopes[t]!)
    sMax = Math.max(sMax, slopes[t]!)
  }
  const defects = vertexAngleDefects(new Float64Array(nV), V, T, isBoundary)
  let anticlastic = 0,
    interiorArea = 0
  for (let v = 0; v < nV; v++) {
    if (isBoundary[v]) continue
    interiorArea += vertexAreas[v]!
    if (defects[v]! < -DEFECT_TOLERANCE) anticlastic += vertexAreas[v]!
  }
  let perimeter = 0
  for (const B of mesh.boundaryLoops) {
    for (let k = 0; k < B.length; k++) {
      const a = 3 * B[k]!,
        b = 3 * B[(k + 1) % B.length]!
      perimeter += Math.hypot(V[b]! - V[a]!, V[b + 1]! - V[a + 1]!, V[b + 2]! - V[a + 2]!)
    }
  }
  const flatThreshold = options.flatThreshold ?? DEFAULT_FLAT_THRESHOLD
  const span = Math.max(Math.sqrt(planArea), zMax - zMin, 1e-9)
  const pockets = pondingPockets(
    V,
    buildVertexNeighbours(nV, T),
    isBoundary,
    vertexPlanAreas,
    options.minPondingDepth ?? 1e-6 * span,
  )
  return {
    area,
    planArea,
    perimeter,
    cables: cableFigures(mesh, frame),
    heightRange: nV > 0 ? [zMin, zMax] : [0, 0],
    slopeRange: nT > 0 ? [sMin, sMax] : [0, 0],
    slopeHistogram: slopeHistogram(slopes, areas, HISTOGRAM_BINS),
    flatThreshold,
    flatShare: flatAreaShare(slopes, areas, flatThreshold),
    pondingPockets: pockets.map(({ x, y, z, area: a }) => ({ x, y, z, area: a })),
    anticlasticShare: interiorArea > 0 ? anticlastic / interiorArea : 0,
    reactions: frameReactions(mesh, frame),
    residual: options.residual ?? 0,
    minAngle: mesh.minAngle,
  }
}
