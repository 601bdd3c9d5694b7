import { NotPositiveDefiniteError } from '../linalg/ldl'
import type { SolverReason } from '../protocol/solver-reasons'
import type { SolverReport } from '../types'
import { now, report, type SolveControl } from './control'
import { cornerCotanWeights } from './cotan-laplacian'
import { membraneEnergy, membraneGradient, type MembraneStress } from './membrane-energy'
import type { CableLoad } from './membrane-fibres'
import { assembleProjectedHessian, type ProjectedLayout } from './membrane-hessian'
import { spatialSetup, type SpatialProblem, type SpatialSetup } from './spatial'
import { harmonicTarget, slideTangentially } from './spatial-assembly'
import { fillBasis, vertexNormals } from './spatial-directions'

export const SPATIAL_NEWTON_METHOD = 'newton-spatial'

/** A spatial problem with warp/fill prestress (prestress stays the scale of the residual, kN/m). */
export interface NewtonProblem extends SpatialProblem {
  stress: MembraneStress
  /**
   * #V×3, m: the metric of the tangential regulariser (default: the start surface). The plan mesh
   * for plan-meshed frames: its harmonic map keeps each vertex over its plan place where it can.
   */
  metric?: Float64Array
  /** Start interior vertices at the harmonic map of the boundary on the metric (small slopes). */
  coldStart?: boolean
}

export interface NewtonResult {
  vertices: Float64Array
  report: SolverReport
  setup: SpatialSetup
}

/** Newton steps without halving the residual before the solve gives up (stalled / no equilibrium). */
const PATIENCE = 12

/**
 * Second-order spatial solve: Newton's method on E = σ_iso·area + fibres + Σ T·l (membrane-energy.ts)
 * over moves along the vertex normals, plus the in-surface binormal at cable vertices — the second
 * variation of area for normal moves (the Jacobi operator) with the exact cable stiffness, in one
 * system. Each step: Bᵀ∇²E B α = −Bᵀ∇E solved by the kept LDLᵀ (nested dissection, symbolic analysis
 * reused across steps and edits through `cached`), PCG with an older factor while it converges
 * fast; a non-positive pivot (an unstable direction far from the solution) adds a growing multiple
 * of the diagonal (Levenberg–Marquardt). A backtracking line search on E keeps every step downhill.
 * Then interior vertices slide in their tangent plane toward the harmonic map of the boundary on
 * the start metric: a purely tangential move, so it keeps the mesh healthy without changing the
 * shape the normal equations settle to. Residual as in spatial.ts (dimensionless 2H·L).
 * Ends 'no-equilibrium' when faces collapse or the area falls below 5 % of the start (a film
 * pinching off), 'stalled' / 'line-search-failed' otherwise when no progress: the caller may then
 * fall back to the first-order iteration.
 */
export function solveSpatialNewton(
  problem: Readonly<NewtonProblem>,
  control: SolveControl = {},
  cached?: SpatialSetup,
): NewtonResult {
  const start = now()
  const { triangles, stress } = problem
  const cables: CableLoad = { segments: problem.cableSegments, tensions: problem.cableTensions }
  const setup = cached ?? spatialSetup(problem)
  const { vertexPattern, freeVertices, system, regulariser } = setup
  const layout: ProjectedLayout = { vertexPattern, dofs: system.pattern, segmentSlots: setup.segmentSlots }
  const dofs = system.pattern
  const m = dofs.matrix.n
  const x = Float64Array.from(problem.vertices)
  const trial = new Float64Array(x.length)
  const gradient = new Float64Array(x.length)
  const faceAreas = new Float64Array(triangles.length / 3)
  const vertexAreas = new Float64Array(x.length / 3)
  const normals = new Float64Array(x.length)
  const basis = new Float64Array(3 * m)
  const rhs = new Float64Array(m)
  const alpha = new Float64Array(m)
  const target = new Float64Array(x.length)
  const before = new Float64Array(triangles.length)
  const startWeights = new Float64Array(triangles.length)
  cornerCotanWeights(startWeights, new Float64Array(triangles.length / 3), problem.metric ?? x, triangles)
  const hasCables = problem.cableTensions.length > 0
  if (problem.coldStart) {
    harmonicTarget(target, regulariser, x, x, triangles, startWeights)
    x.set(target)
  }
  const tolerance = control.tolerance ?? 1e-10
  const maxIterations = Math.min(control.maxIterations ?? 100, 100)
  const sigma = problem.prestress
  let iterations = 0
  let firstArea = 0
  let best = Infinity
  let bestIteration = 0
  let areaAtBest = 0
  let shift = 0
  let targetReady = false
  const done = (residual: number, reason?: SolverReason): NewtonResult => ({
    vertices: x,
    report: report(SPATIAL_NEWTON_METHOD, start, iterations, residual, reason),
    setup,
  })
  for (;;) {
    membraneGradient(gradient, faceAreas, x, triangles, stress, cables)
    let area = 0
    let smallest = Infinity
    vertexAreas.fill(0)
    for (let t = 0; t < faceAreas.length; t++) {
      const a = faceAreas[t]!
      area += a
      if (a < smallest) smallest = a
      for (let k = 0; k < 3; k++) vertexAreas[triangles[3 * t + k]!]! += a / 3
    }
    if (iterations === 0) firstArea = area
    vertexNormals(normals, x, triangles)
    fillBasis(basis, dofs, freeVertices, normals, setup.cableNeighbours, x)
    let worst = 0
    for (let row = 0; row < freeVertices.length; row++) {
      const v = freeVertices[row]!
      let sum = 0
      for (let a = dofs.dofStart[row]!; a < dofs.dofStart[row + 1]!; a++) {
        const g =
          basis[3 * a]! * gradient[3 * v]! +
          basis[3 * a + 1]! * gradient[3 * v + 1]! +
          basis[3 * a + 2]! * gradient[3 * v + 2]!
        rhs[a] = -g
        sum += g * g
      }
      const r = Math.sqrt(sum) / (sigma * vertexAreas[v]!)
      if (!(r <= worst)) worst = r
    }
    const residual = worst * Math.sqrt(area)
    control.onProgress?.(iterations, residual)
    if (!Number.isFinite(residual) || !Number.isFinite(area)) return done(residual, 'diverged')
    if (residual <= tolerance) return done(residual)
    if (smallest < 1e-4 * (firstArea / faceAreas.length) || area < 0.05 * firstArea)
      return done(residual, 'no-equilibrium')
    if (residual < 0.5 * best) {
      best = residual
      bestIteration = iterations
      areaAtBest = area
    } else if (iterations - bestIteration >= PATIENCE) {
      if (residual <= 100 * tolerance) return done(residual)
      return done(residual, area < 0.9 * areaAtBest && residual > 1e4 * tolerance ? 'no-equilibrium' : 'stalled')
    }
    if (control.signal?.aborted) return done(residual, 'cancelled')
    if (iterations >= maxIterations) return done(residual, 'iteration-limit')

    assembleProjectedHessian(layout, basis, x, triangles, stress, cables)
    shift = solveShifted(system, alpha, rhs, residual, shift, false)
    let slope = 0
    for (let a = 0; a < m; a++) slope -= alpha[a]! * rhs[a]!
    if (!(slope < 0)) {
      // PCG with an older factor can return an uphill step on an indefinite matrix: factor afresh
      assembleProjectedHessian(layout, basis, x, triangles, stress, cables)
      shift = solveShifted(system, alpha, rhs, residual, Math.max(shift, 1e-3), true)
      slope = 0
      for (let a = 0; a < m; a++) slope -= alpha[a]! * rhs[a]!
    }
    const energy = membraneEnergy(x, triangles, stress, cables)
    faceNormals(before, x, triangles)
    let t = 1
    for (;;) {
      trial.set(x)
      moveAlong(trial, alpha, basis, dofs.dofStart, freeVertices, t)
      // a step that folds a face over lowers the area without approaching any membrane: refused
      const e = folds(before, trial, triangles) ? Infinity : membraneEnergy(trial, triangles, stress, cables)
      // Armijo with a rounding allowance: near convergence energy changes reach 1e-16·E
      if (e - energy <= 1e-4 * t * slope + 1e-13 * Math.abs(energy)) break
      t /= 2
      if (t < 1e-8) {
        if (residual <= 100 * tolerance) return done(residual)
        return done(residual, slope >= 0 ? 'stalled' : 'line-search-failed')
      }
    }
    x.set(trial)
    if (hasCables || !targetReady) {
      harmonicTarget(target, regulariser, x, x, triangles, startWeights)
      targetReady = true
    }
    vertexNormals(normals, x, triangles)
    slideTangentially(x, target, normals, regulariser.pattern.freeIndex)
    iterations++
  }
}

/** out: #T×3 face normals scaled by twice the area. */
function faceNormals(out: Float64Array, x: Readonly<Float64Array>, triangles: Readonly<Uint32Array>): void {
  for (let t = 0; t < triangles.length; t += 3) {
    const a = 3 * triangles[t]!,
      b = 3 * triangles[t + 1]!,
      c = 3 * triangles[t + 2]!
    const ux = x[b]! - x[a]!,
      uy = x[b + 1]! - x[a + 1]!,
      uz = x[b + 2]! - x[a + 2]!
    const vx = x[c]! - x[a]!,
      vy = x[c + 1]! - x[a + 1]!,
      vz = x[c + 2]! - x[a + 2]!
    out[t] = uy * vz - uz * vy
    out[t + 1] = uz * vx - ux * vz
    out[t + 2] = ux * vy - uy * vx
  }
}

/** True when some face of x turned by more than 90° from its normal in `normals` (faceNormals). */
function folds(normals: Readonly<Float64Array>, x: Readonly<Float64Array>, triangles: Readonly<Uint32Array>): boolean {
  for (let t = 0; t < triangles.length; t += 3) {
    const a = 3 * triangles[t]!,
      b = 3 * triangles[t + 1]!,
      c = 3 * triangles[t + 2]!
    const ux = x[b]! - x[a]!,
      uy = x[b + 1]! - x[a + 1]!,
      uz = x[b + 2]! - x[a + 2]!
    const vx = x[c]! - x[a]!,
      vy = x[c + 1]! - x[a + 1]!,
      vz = x[c + 2]! - x[a + 2]!
    const dot =
      normals[t]! * (uy * vz - uz * vy) + normals[t + 1]! * (uz * vx - ux * vz) + normals[t + 2]! * (ux * vy - uy * vx)
    if (!(dot > 0)) return true
  }
  return false
}

/** x += t·B·alpha over the free vertices. */
function moveAlong(
  x: Float64Array,
  alpha: Readonly<Float64Array>,
  basis: Readonly<Float64Array>,
  dofStart: Readonly<Int32Array>,
  freeVertices: Readonly<Int32Array>,
  t: number,
): void {
  for (let row = 0; row < freeVertices.length; row++) {
    const v = 3 * freeVertices[row]!
    for (let a = dofStart[row]!; a < dofStart[row + 1]!; a++) {
      const s = t * alpha[a]!
      x[v]! += s * basis[3 * a]!
      x[v + 1]! += s * basis[3 * a + 1]!
      x[v + 2]! += s * basis[3 * a + 2]!
    }
  }
}

/**
 * Solves the Newton system, adding shift × (mean diagonal) to the diagonal while a pivot is not
 * positive (the matrix is indefinite away from a stable equilibrium). Returns the shift used, as
 * the next step's first guess (divided by 10, dropped below 1e-8).
 */
function solveShifted(
  system: SpatialSetup['system'],
  out: Float64Array,
  rhs: Readonly<Float64Array>,
  residual: number,
  previous: number,
  direct: boolean,
): number {
  const matrix = system.pattern.matrix
  let meanDiagonal = 0
  for (let i = 0; i < matrix.n; i++) meanDiagonal += matrix.values[matrix.diagonal[i]!]! / matrix.n
  let shift = direct ? previous : previous / 10 < 1e-8 ? 0 : previous / 10
  const tolerance = Math.min(1e-3, Math.max(1e-13, residual * 1e-3))
  for (;;) {
    if (shift > 0) for (let i = 0; i < matrix.n; i++) matrix.values[matrix.diagonal[i]!]! += shift * meanDiagonal
    try {
      if (direct) system.solveDirect(out, rhs)
      else system.solve(out, rhs, tolerance, 12)
      return shift
    } catch (error) {
      if (!(error instanceof NotPositiveDefiniteError)) throw error
      if (shift > 0) for (let i = 0; i < matrix.n; i++) matrix.values[matrix.diagonal[i]!]! -= shift * meanDiagonal
      shift = shift === 0 ? 1e-4 : shift * 10
      if (shift > 1e6) throw error
    }
  }
}
