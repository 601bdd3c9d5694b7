import type { SolverReport } from '../types'
import type { SolveControl } from './control'
import { membraneStress, stressDeviation, type WarpFillPrestress } from './membrane-fibres'
import { solveSpatial, type SpatialProblem, type SpatialSetup } from './spatial'
import { solveSpatialNewton } from './spatial-newton'

/** Reasons after which the second-order solve hands over to the first-order iteration. */
const NO_PROGRESS = new Set(['stalled', 'line-search-failed', 'iteration-limit', 'diverged'])

export interface SpatialPathResult {
  vertices: Float64Array
  report: SolverReport
  setup: SpatialSetup
}

/**
 * The spatial path: the second-order solve (spatial-newton.ts) under warp/fill prestress laid out
 * on `reference` (#V×3, m: the plan mesh when plan is true, else the start loft); when it cannot
 * make progress and warp = fill, the first-order surface-stress-density iteration (spatial.ts)
 * takes over from the start and the report's method names both. Settled reports carry the
 * deviation of the settled stresses from the prescribed ones. coldStart: begin from the harmonic
 * map of the boundary (the small-slope surface) instead of the given interior.
 */
export function solveSpatialPath(
  problem: Readonly<SpatialProblem>,
  prestress: Readonly<WarpFillPrestress>,
  reference: Readonly<Float64Array>,
  plan: boolean,
  control: SolveControl,
  cached?: SpatialSetup,
  coldStart = false,
): SpatialPathResult {
  const stress = membraneStress(prestress, reference, problem.triangles, plan)
  const metric = plan ? Float64Array.from(reference, (c, i) => (i % 3 === 2 ? 0 : c)) : undefined
  const newton = solveSpatialNewton({ ...problem, stress, coldStart, ...(metric && { metric }) }, control, cached)
  let { vertices, report } = newton
  let setup = newton.setup
  if (!report.converged && NO_PROGRESS.has(report.reason ?? '') && !stress.fibres) {
    const first = solveSpatial(problem, control, setup)
    vertices = first.vertices
    setup = first.setup
    report = {
      ...first.report,
      method: `${report.method}+${first.report.method}`,
      iterations: report.iterations + first.report.iterations,
      ms: report.ms + first.report.ms,
    }
  }
  if (report.converged) report = { ...report, stressDeviation: stressDeviation(vertices, problem.triangles, stress) }
  return { vertices, report, setup }
}
