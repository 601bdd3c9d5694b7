import { expandPattern, type DofPattern } from '../linalg/dof-pattern'
import { trianglePattern, type TrianglePattern } from '../linalg/triangle-pattern'
import type { SolverReason } from '../protocol/solver-reasons'
import type { SolverReport } from '../types'
import { now, report, type SolveControl } from './control'
import { assembleCotanLaplacian, cornerCotanWeights } from './cotan-laplacian'
import {
  addCables,
  cableSlots,
  harmonicTarget,
  projectedResidual,
  slideTangentially,
  subtractProduct,
} from './spatial-assembly'
import { fillBasis, projectSystem, vertexNormals } from './spatial-directions'
import { rowCoordinates, SpdSystem } from './spd-system'

export const SPATIAL_METHOD = 'surface-stress-density'

/**
 * Over-relaxation of the cable binormal moves: the step sees interior vertices frozen in the
 * tangent plane, so it undershoots the cable's move. Measured on the flat cable test: iterations
 * 69 → 41 (h = 0.25 m) and 289 → 176 (h = 0.125 m) with 1.5; 1.8 was worse.
 */
const CABLE_OVERRELAXATION = 1.5

/** A membrane in space: rigid frame vertices held, cable-edge vertices free on their cables. */
export interface SpatialProblem {
  /** #V×3 Float64Array, m: the start surface (a loft, or the previous solution). */
  vertices: Float64Array
  /** #T×3 Uint32Array. */
  triangles: Uint32Array
  /** #V Uint8Array, 1 = held (rigid frame, frame points). */
  isFixed: Uint8Array
  /** #S×2 Uint32Array: vertex pairs of the cable segments, in chain order along each cable. */
  cableSegments: Uint32Array
  /** #S Float64Array: cable tension T, kN. */
  cableTensions: Float64Array
  /** Isotropic membrane prestress σ, kN/m (> 0). */
  prestress: number
}

/** Everything that depends only on the topology, the fixed set and the cables (reuse it). */
export interface SpatialSetup {
  vertexPattern: TrianglePattern
  /** Row of the reduced vertex system → vertex. */
  freeVertices: Int32Array
  /** #V×2: the two cable neighbours of each free cable vertex, else -1. */
  cableNeighbours: Int32Array
  segmentSlots: Int32Array
  /** Unknowns: one normal move per interior vertex, normal + binormal per cable vertex. */
  system: SpdSystem<DofPattern>
  /** Harmonic map with the whole boundary held: the tangential target. */
  regulariser: SpdSystem
}

export interface SpatialResult {
  /** #V×3 Float64Array, m. */
  vertices: Float64Array
  report: SolverReport
  setup: SpatialSetup
}

/** Builds the topology-only part of a spatial solve. */
export function spatialSetup(problem: Readonly<SpatialProblem>): SpatialSetup {
  const { triangles, isFixed, cableSegments } = problem
  const vertexCount = problem.vertices.length / 3
  const vertexPattern = trianglePattern(vertexCount, triangles, isFixed)
  const cableNeighbours = new Int32Array(2 * vertexCount).fill(-1)
  const onBoundary = Uint8Array.from(isFixed)
  for (let s = 0; s < cableSegments.length; s++) {
    const v = cableSegments[s]!,
      other = cableSegments[s ^ 1]!
    onBoundary[v] = 1
    if (isFixed[v]) continue
    if (cableNeighbours[2 * v]! < 0) cableNeighbours[2 * v] = other
    else cableNeighbours[2 * v + 1] = other
  }
  const { freeIndex, matrix } = vertexPattern
  const freeVertices = new Int32Array(matrix.n)
  const dofCount = new Uint8Array(matrix.n)
  for (let v = 0; v < vertexCount; v++) {
    const f = freeIndex[v]!
    if (f < 0) continue
    freeVertices[f] = v
    dofCount[f] = cableNeighbours[2 * v + 1]! >= 0 ? 2 : 1
  }
  const dofs = expandPattern(matrix, dofCount)
  const regular = trianglePattern(vertexCount, triangles, onBoundary)
  return {
    vertexPattern,
    freeVertices,
    cableNeighbours,
    segmentSlots: cableSlots(vertexPattern, cableSegments),
    system: new SpdSystem(dofs, dofCoordinates(problem.vertices, freeVertices, dofs.dofStart)),
    regulariser: new SpdSystem(regular, rowCoordinates(problem.vertices, regular.freeIndex, regular.matrix.n)),
  }
}

/**
 * Equilibrium of an isotropically prestressed membrane with edge cables by the surface stress
 * density method (Maurin & Motro 1998), under isotropic prestress the iteration of Pinkall &
 * Polthier (1993): each step minimises σ × the Dirichlet energy on the current surface's metric,
 * with cables of force density q = T/l on their segments (Linkwitz & Schek 1971), over moves along
 * the vertex normals (and the in-surface binormal on cables), so its fixed point is exact normal
 * equilibrium. Interior vertices then slide tangentially toward the harmonic map of the boundary
 * on the start metric, which keeps triangles from collapsing. Residual: max over free vertices of
 * |force along the moving directions| / (σ · vertex area) × √(area), dimensionless.
 * 'no-equilibrium' when faces collapse, the area falls below 5 % of the start, or 100 iterations
 * pass without halving the residual while the area keeps falling (e.g. a catenoid pulled past its
 * largest gap: the neck pinches off); 'stalled' for the same stagnation otherwise. A residual that
 * stagnates within 100 × tolerance is the rounding floor of a fine mesh and counts as settled.
 */
export function solveSpatial(
  problem: Readonly<SpatialProblem>,
  control: SolveControl = {},
  cached?: SpatialSetup,
): SpatialResult {
  const start = now()
  const { triangles, prestress: sigma } = problem
  const setup = cached ?? spatialSetup(problem)
  const { vertexPattern, freeVertices, system, regulariser } = setup
  const x = Float64Array.from(problem.vertices)
  const n = freeVertices.length
  const dofs = system.pattern
  const weights = new Float64Array(triangles.length)
  const faceAreas = new Float64Array(triangles.length / 3)
  const vertexAreas = new Float64Array(x.length / 3)
  const force = new Float64Array(3 * n)
  const normals = new Float64Array(x.length)
  const basis = new Float64Array(3 * dofs.matrix.n)
  const rhs = new Float64Array(dofs.matrix.n)
  const alpha = new Float64Array(dofs.matrix.n)
  const target = new Float64Array(x.length)
  const startWeights = new Float64Array(triangles.length)
  cornerCotanWeights(startWeights, faceAreas, x, triangles)
  const tolerance = control.tolerance ?? 1e-10
  const maxIterations = control.maxIterations ?? 2000
  let iterations = 0
  let firstArea = 0
  // progress watch: an equilibrium halves the residual now and then; a pinching film does not
  let best = Infinity
  let bestIteration = 0
  let areaAtBest = 0
  const done = (residual: number, reason?: SolverReason): SpatialResult => ({
    vertices: x,
    report: report(SPATIAL_METHOD, start, iterations, residual, reason),
    setup,
  })
  for (;;) {
    const smallest = cornerCotanWeights(weights, faceAreas, x, triangles)
    let area = 0
    vertexAreas.fill(0)
    for (let t = 0; t < faceAreas.length; t++) {
      area += faceAreas[t]!
      for (let k = 0; k < 3; k++) vertexAreas[triangles[3 * t + k]!]! += faceAreas[t]! / 3
    }
    if (iterations === 0) firstArea = area
    assembleCotanLaplacian(vertexPattern, force, weights, sigma, x, triangles)
    addCables(vertexPattern, force, setup.segmentSlots, problem.cableSegments, problem.cableTensions, x)
    subtractProduct(force, vertexPattern.matrix, x, freeVertices)
    vertexNormals(normals, x, triangles)
    fillBasis(basis, dofs, freeVertices, normals, setup.cableNeighbours, x)
    projectSystem(dofs, rhs, vertexPattern.matrix, basis, force)
    const residual = projectedResidual(rhs, dofs.dofStart, freeVertices, vertexAreas, sigma, Math.sqrt(area))
    control.onProgress?.(iterations, residual)
    if (!Number.isFinite(residual) || !Number.isFinite(area)) return done(residual, 'diverged')
    if (residual <= tolerance) return done(residual)
    if (smallest < 1e-4 * (firstArea / faceAreas.length) || area < 0.05 * firstArea)
      return done(residual, 'no-equilibrium')
    if (residual < 0.5 * best) {
      best = residual
      bestIteration = iterations
      areaAtBest = area
    } else if (iterations - bestIteration >= 100) {
      // near the rounding floor (large fine meshes) stagnation is not a failure of the membrane
      if (residual <= 100 * tolerance) return done(residual)
      return done(residual, area < areaAtBest && residual > 1e4 * tolerance ? 'no-equilibrium' : 'stalled')
    }
    if (control.signal?.aborted) return done(residual, 'cancelled')
    if (iterations >= maxIterations) return done(residual, 'iteration-limit')
    system.solve(alpha, rhs, Math.min(1e-3, Math.max(1e-13, residual * 1e-3)), 20)
    for (let row = 0; row < n; row++) {
      const v = freeVertices[row]!
      for (let a = dofs.dofStart[row]!; a < dofs.dofStart[row + 1]!; a++) {
        const omega = a > dofs.dofStart[row]! ? CABLE_OVERRELAXATION : 1
        for (let d = 0; d < 3; d++) x[3 * v + d]! += omega * alpha[a]! * basis[3 * a + d]!
      }
    }
    harmonicTarget(target, regulariser, x, x, triangles, startWeights)
    vertexNormals(normals, x, triangles)
    slideTangentially(x, target, normals, regulariser.pattern.freeIndex)
    iterations++
  }
}

/** n×3 coordinates per unknown: each unknown sits at its vertex. */
function dofCoordinates(
  vertices: Readonly<Float64Array>,
  freeVertices: Readonly<Int32Array>,
  dofStart: Readonly<Int32Array>,
): Float64Array {
  const out = new Float64Array(3 * dofStart[freeVertices.length]!)
  for (let row = 0; row < freeVertices.length; row++) {
    const v = freeVertices[row]!
    for (let a = dofStart[row]!; a < dofStart[row + 1]!; a++) out.set(vertices.subarray(3 * v, 3 * v + 3), 3 * a)
  }
  return out
}
