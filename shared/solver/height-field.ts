import { trianglePattern } from '../linalg/triangle-pattern'
import type { SolverReason } from '../protocol/solver-reasons'
import type { SolverReport } from '../types'
import {
  areaHessianProduct,
  assembleAreaHessian,
  heightFieldArea,
  heightFieldAreaGradient,
  planElements,
  type PlanElements,
} from './area-functional'
import { now, report, type SolveControl } from './control'
import { rowCoordinates, SpdSystem } from './spd-system'

export const HEIGHT_FIELD_METHOD = 'newton-height-field'

/** A height-field problem: plan mesh, fixed heights on the rigid frame, unknown heights inside. */
export interface HeightFieldProblem {
  /** #V×3 Float64Array, m. z of fixed vertices is the frame height; z of free ones the start (warm). */
  vertices: Float64Array
  /** #T×3 Uint32Array. */
  triangles: Uint32Array
  /** #V Uint8Array, 1 = held (rigid frame). */
  isFixed: Uint8Array
}

export interface HeightFieldResult {
  /** #V Float64Array: solved heights, m (fixed ones unchanged). */
  heights: Float64Array
  report: SolverReport
  /** Pattern, ordering and last factor: pass back for the next solve on the same topology. */
  system: SpdSystem
  /** Largest face slope |∇u| (dimensionless): near-vertical faces mean "not a height field". */
  steepest: number
}

/**
 * Minimal surface z = u(x, y) over a plan mesh by Newton's method on the area (see
 * area-functional.ts) with a backtracking line search on the area. Cold start (warm = false): the
 * small-slope solution, Laplace's equation with the frame heights. Warm start: the given z; with
 * `previous` (#V heights of the last solution, old frame heights included) the frame's change is
 * first carried inside by the linearised response H(previous)·δ = −H·Δframe (a predictor step).
 * Residual: max over free vertices of |∂Area/∂u_i| / (vertex plan area) × √(plan area), i.e. the
 * discrete 2H·L, dimensionless. Newton systems are solved by PCG with the kept factor, refactored
 * when PCG slows (SpdSystem). Known limit: frames whose surface turns vertical (not a height field)
 * stall or diverge here; use the spatial path.
 */
export function solveHeightField(
  problem: Readonly<HeightFieldProblem>,
  control: SolveControl = {},
  warm = false,
  system?: SpdSystem,
  previous?: Readonly<Float64Array>,
): HeightFieldResult {
  const start = now()
  const { vertices, triangles, isFixed } = problem
  const vertexCount = vertices.length / 3
  const plan = planElements(vertices, triangles)
  const sys = system ?? newSystem(vertices, triangles, isFixed)
  const { freeIndex } = sys.pattern
  const n = sys.size
  const u = new Float64Array(vertexCount)
  for (let v = 0; v < vertexCount; v++) u[v] = isFixed[v] || warm ? vertices[3 * v + 2]! : 0
  const tolerance = control.tolerance ?? 1e-10
  const maxIterations = control.maxIterations ?? 60
  const gradient = new Float64Array(vertexCount)
  const rhs = new Float64Array(n)
  const step = new Float64Array(n)
  const trial = new Float64Array(vertexCount)
  let planArea = 0
  for (let v = 0; v < vertexCount; v++) planArea += plan.vertexAreas[v]!
  const scale = Math.sqrt(planArea)
  const done = (iterations: number, residual: number, reason?: SolverReason): HeightFieldResult => ({
    heights: u,
    report: report(HEIGHT_FIELD_METHOD, start, iterations, residual, reason),
    system: sys,
    steepest: steepestSlope(plan, u),
  })

  let iterations = 0
  if (!warm) {
    // one Newton step with the slope-zero Hessian from u = 0 inside gives Laplace's solution
    heightFieldAreaGradient(gradient, plan, u, true)
    gatherNegated(rhs, gradient, freeIndex)
    assembleAreaHessian(sys.pattern, plan, u, true)
    sys.solveDirect(step, rhs)
    scatterAdd(u, step, freeIndex, 1)
    iterations = 1
  } else if (previous) {
    iterations = predict(u, previous, plan, sys, gradient, rhs, step)
  }
  let residual = residualOf(gradient, plan, u, freeIndex, scale)
  control.onProgress?.(iterations, residual)
  let area = heightFieldArea(plan, u)
  while (residual > tolerance) {
    if (!Number.isFinite(residual) || !Number.isFinite(area)) return done(iterations, residual, 'diverged')
    if (control.signal?.aborted) return done(iterations, residual, 'cancelled')
    if (iterations >= maxIterations) return done(iterations, residual, 'iteration-limit')
    gatherNegated(rhs, gradient, freeIndex)
    assembleAreaHessian(sys.pattern, plan, u)
    // forcing term: solve loosely far from the solution, tightly near it (inexact Newton)
    sys.solve(step, rhs, Math.min(1e-2, Math.max(1e-13, residual * 1e-2)))
    let slope = 0
    for (let i = 0; i < n; i++) slope -= step[i]! * rhs[i]!
    let t = 1
    let trialArea: number
    for (;;) {
      trial.set(u)
      scatterAdd(trial, step, freeIndex, t)
      trialArea = heightFieldArea(plan, trial)
      // Armijo with a rounding allowance, since near convergence area changes reach 1e-16·area
      if (trialArea - area <= 1e-4 * t * slope + 1e-14 * Math.abs(area)) break
      t /= 2
      if (t < 1e-10) return done(iterations, residual, slope >= 0 ? 'stalled' : 'line-search-failed')
    }
    u.set(trial)
    area = trialArea
    iterations++
    residual = residualOf(gradient, plan, u, freeIndex, scale)
    control.onProgress?.(iterations, residual)
  }
  return done(iterations, residual)
}

function residualOf(
  gradient: Float64Array,
  plan: Readonly<PlanElements>,
  u: Readonly<Float64Array>,
  freeIndex: Readonly<Int32Array>,
  scale: number,
): number {
  heightFieldAreaGradient(gradient, plan, u)
  let worst = 0
  for (let v = 0; v < freeIndex.length; v++) {
    if (freeIndex[v]! < 0) continue
    const r = Math.abs(gradient[v]!) / plan.vertexAreas[v]!
    if (!(r <= worst)) worst = r // NaN propagates as "worst"
  }
  return worst * scale
}

function gatherNegated(out: Float64Array, full: Readonly<Float64Array>, freeIndex: Readonly<Int32Array>): void {
  for (let v = 0; v < freeIndex.length; v++) {
    const f = freeIndex[v]!
    if (f >= 0) out[f] = -full[v]!
  }
}

function scatterAdd(
  full: Float64Array,
  reduced: Readonly<Float64Array>,
  freeIndex: Readonly<Int32Array>,
  t: number,
): void {
  for (let v = 0; v < freeIndex.length; v++) {
    const f = freeIndex[v]!
    if (f >= 0) full[v]! += t * reduced[f]!
  }
}

/** Predictor from `previous` toward the new frame heights in u; returns the steps taken (0 or 1). */
function predict(
  u: Float64Array,
  previous: Readonly<Float64Array>,
  plan: Readonly<PlanElements>,
  sys: SpdSystem,
  work: Float64Array,
  rhs: Float64Array,
  step: Float64Array,
): number {
  const { freeIndex } = sys.pattern
  const delta = new Float64Array(u.length)
  let moved = false
  for (let v = 0; v < u.length; v++) {
    if (freeIndex[v]! >= 0) continue
    delta[v] = u[v]! - previous[v]!
    if (delta[v] !== 0) moved = true
  }
  if (!moved) return 0
  areaHessianProduct(work, plan, previous, delta)
  gatherNegated(rhs, work, freeIndex)
  assembleAreaHessian(sys.pattern, plan, previous)
  sys.solve(step, rhs, 1e-6)
  for (let v = 0; v < u.length; v++) if (freeIndex[v]! >= 0) u[v] = previous[v]!
  scatterAdd(u, step, freeIndex, 1)
  return 1
}

/** max over faces of |∇u| (the discrete area is convex, so a solution always exists; a huge slope
 * shows the continuous surface wants to turn vertical there). */
function steepestSlope(plan: Readonly<PlanElements>, u: Readonly<Float64Array>): number {
  const { triangles, data } = plan
  let worst = 0
  for (let t = 0, o = 0; o < data.length; t += 3, o += 7) {
    if (data[o] === 0) continue
    const u0 = u[triangles[t]!]!,
      u1 = u[triangles[t + 1]!]!,
      u2 = u[triangles[t + 2]!]!
    const gx = u0 * data[o + 1]! + u1 * data[o + 2]! + u2 * data[o + 3]!
    const gy = u0 * data[o + 4]! + u1 * data[o + 5]! + u2 * data[o + 6]!
    const g = Math.hypot(gx, gy)
    if (!(g <= worst)) worst = g
  }
  return worst
}

/** A system on the free vertices, ordered by nested dissection of their positions. */
function newSystem(
  vertices: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  isFixed: Readonly<Uint8Array>,
): SpdSystem {
  const pattern = trianglePattern(vertices.length / 3, triangles, isFixed)
  return new SpdSystem(pattern, rowCoordinates(vertices, pattern.freeIndex, pattern.matrix.n))
}
