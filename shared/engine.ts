/**
 * The form-finding engine: frame in, solved surface out. Chooses the path (height field or spatial),
 * keeps the mesh, the factorisations and the last solution between calls so that an edit that only
 * moves frame points re-solves warm. Pure TypeScript: runs in a worker thread and in the browser.
 * Caution: form-finding is preliminary; loads, stresses, patterning, anchors and connections are
 * checked by a qualified engineer under local codes.
 */
import { computeFigures } from './figures'
import { frameNeedsParametricMesh, frameNeedsSpatialSolve, validateFrame } from './frame'
import { meshFrame, meshParametric, remapMesh } from './mesh'
import { frameConstraints, frameStructureKey, isotropicPrestress } from './solver/frame-problem'
import { solveHeightField } from './solver/height-field'
import type { SpatialSetup } from './solver/spatial'
import { solveSpatialPath } from './solver/spatial-path'
import type { SpdSystem } from './solver/spd-system'
import type { Frame, MembraneMesh, SolverReport, SurfaceResult } from './types'

export interface EngineOptions {
  /** Called after every solver iteration with the dimensionless residual. */
  onProgress?(iteration: number, residual: number): void
  /** Checked between iterations; when aborted the result is unsettled with reason 'cancelled'. */
  signal?: { readonly aborted: boolean }
  /** Dimensionless residual to reach (default 1e-10). */
  tolerance?: number
  maxIterations?: number
}

export interface EngineResult {
  /** The frame's mesh with solved vertices (#V×3, m). */
  mesh: MembraneMesh
  report: SolverReport
}

export interface SurfaceSolver {
  /** Solve `frame` (validated here: FrameError names the field); warm when only points moved. */
  solve(frame: Readonly<Frame>, options?: EngineOptions): EngineResult
  /** Forget the cached mesh, factorisations and solution. */
  reset(): void
}

/**
 * Faces steeper than this (|∇u| = tan 75°) send a settled height field on to the spatial path: the
 * discrete height-field area is convex and always has a minimiser, even where the true membrane
 * turns vertical and overhangs (a mast ring raised past the graph limit).
 */
const STEEP_SLOPE = Math.tan((75 * Math.PI) / 180)

interface Cache {
  structureKey: string
  /** Meshed by meshParametric (rings over rings, or a two-loop frame too steep for a plan mesh). */
  parametric: boolean
  /** The mesh as meshed or remapped for the last frame (start positions, not solved). */
  mesh: MembraneMesh
  /** Last solved positions when they were settled, for warm starts. */
  solved: Float64Array | undefined
  heightSystem?: SpdSystem
  spatial?: SpatialSetup
}

/** A stateful surface solver for one room (one frame edited over time). */
export function createSurfaceSolver(): SurfaceSolver {
  let cache: Cache | undefined
  /** Meshes (warm when the cache allows) and solves; returns the new cache entry too. */
  const attempt = (frame: Frame, structureKey: string, parametric: boolean, options: EngineOptions) => {
    let mesh: MembraneMesh | null = null
    const reusable = cache && cache.structureKey === structureKey && cache.parametric === parametric ? cache : undefined
    if (reusable) {
      mesh = parametric ? meshParametric(frame).mesh : remapMesh(reusable.mesh, frame)
      if (mesh && mesh.topologyKey !== reusable.mesh.topologyKey) mesh = null
    }
    const previous = mesh ? reusable : undefined
    mesh ??= parametric ? meshParametric(frame).mesh : meshFrame(frame)
    const next: Cache = { structureKey, parametric, mesh, solved: undefined }
    if (previous)
      Object.assign(next, {
        heightSystem: previous.heightSystem,
        spatial: previous.spatial,
      })
    // a steep two-loop frame is better re-meshed as an annulus than continued on its plan mesh
    const remeshable = !parametric && frame.loops.length === 2
    return {
      next,
      mesh,
      warm: previous?.solved !== undefined,
      ...solveOnMesh(
        frame,
        mesh,
        next,
        previous && { solved: previous.solved, mesh: previous.mesh },
        options,
        !remeshable,
      ),
    }
  }
  return {
    reset() {
      cache = undefined
    },
    solve(input, options = {}) {
      const frame = validateFrame(input as Frame)
      const structureKey = frameStructureKey(frame)
      const sticky = cache?.structureKey === structureKey && cache.parametric
      let outcome = attempt(frame, structureKey, frameNeedsParametricMesh(frame) || sticky, options)
      if (outcome.warm && !outcome.report.converged && outcome.report.reason !== 'cancelled') {
        // a large move can leave the warm start too far from equilibrium for the spatial path's
        // progress watch; a cold start costs one solve more and never does worse than a fresh room
        cache = undefined
        const warmMs = outcome.report.ms
        outcome = attempt(frame, structureKey, frameNeedsParametricMesh(frame), options)
        outcome.report = { ...outcome.report, ms: outcome.report.ms + warmMs }
      }
      if (outcome.steep) {
        const first = outcome.report
        outcome = attempt(frame, structureKey, true, options)
        const { method, iterations, ms } = outcome.report
        outcome.report = {
          ...outcome.report,
          method: `${first.method}+${method}`,
          iterations: first.iterations + iterations,
          ms: first.ms + ms,
        }
      }
      const { next, mesh, vertices, report } = outcome
      const finite = vertices.every(Number.isFinite)
      next.solved = finite && report.converged ? vertices : undefined
      cache = next
      if (!finite) {
        return {
          mesh,
          report: {
            ...report,
            converged: false,
            reason: 'diverged',
            residual: Number.MAX_VALUE,
          },
        }
      }
      return { mesh: { ...mesh, vertices }, report }
    },
  }
}

/**
 * Runs the right path on `mesh`, warm from `solved` when given; updates the systems in `cache`.
 * steep: the height field turned near-vertical and continuing on this plan mesh was not allowed.
 */
function solveOnMesh(
  frame: Readonly<Frame>,
  mesh: Readonly<MembraneMesh>,
  cache: Cache,
  previous: { solved: Float64Array | undefined; mesh: Readonly<MembraneMesh> } | undefined,
  control: EngineOptions,
  continueSteep: boolean,
): { vertices: Float64Array; report: SolverReport; steep: boolean } {
  const constraints = frameConstraints(mesh, frame)
  // warp ≠ fill is solved by the spatial path only (the height-field energy is isotropic)
  const anisotropic = frame.prestress.warp !== frame.prestress.fill
  const spatialPath = cache.parametric || frameNeedsSpatialSolve(frame) || anisotropic
  const start = Float64Array.from(mesh.vertices)
  const solved = previous?.solved
  if (previous && solved) {
    const before = previous.mesh.vertices
    for (let v = 0; v < constraints.isFixed.length; v++) {
      // held vertices take the new frame; free ones resume where the last solution left them,
      // carried along by the remap's smooth blend of the frame point moves (so a raised corner
      // lifts its neighbours instead of leaving slivers next to it)
      if (constraints.isFixed[v]) continue
      if (spatialPath)
        for (let d = 0; d < 3; d++)
          start[3 * v + d] = solved[3 * v + d]! + mesh.vertices[3 * v + d]! - before[3 * v + d]!
      else start[3 * v + 2] = solved[3 * v + 2]!
    }
  }
  const spatial = (from: Float64Array, earlier?: SolverReport, cold = false) => {
    const problem = {
      vertices: from,
      triangles: mesh.triangles,
      ...constraints,
      prestress: isotropicPrestress(frame),
    }
    // fibres are laid on the mesh as meshed (the plan for plan meshes): the same for warm and cold
    const plan = !cache.parametric
    const result = solveSpatialPath(problem, frame.prestress, mesh.vertices, plan, control, cache.spatial, cold && plan)
    cache.spatial = result.setup
    const report = earlier
      ? {
          ...result.report,
          method: `${earlier.method}+${result.report.method}`,
          iterations: earlier.iterations + result.report.iterations,
          ms: earlier.ms + result.report.ms,
        }
      : result.report
    return { vertices: result.vertices, report, steep: false }
  }
  if (spatialPath) return spatial(start, undefined, !solved)
  const previousHeights = solved && Float64Array.from({ length: solved.length / 3 }, (_, v) => solved[3 * v + 2]!)
  const problem = {
    vertices: start,
    triangles: mesh.triangles,
    isFixed: constraints.isFixed,
  }
  const result = solveHeightField(problem, control, solved !== undefined, cache.heightSystem, previousHeights)
  cache.heightSystem = result.system
  const vertices = Float64Array.from(start)
  for (let v = 0; v < result.heights.length; v++) vertices[3 * v + 2] = result.heights[v]!
  const steep = result.steepest > STEEP_SLOPE
  if ((result.report.converged && !steep) || result.report.reason === 'cancelled')
    return { vertices, report: result.report, steep: false }
  if (steep && !continueSteep) return { vertices, report: result.report, steep: true }
  // the surface turns (nearly) vertical and may overhang, or Newton failed: continue in 3D
  return spatial(vertices.every(Number.isFinite) ? vertices : start, result.report)
}

/**
 * One-shot solve with figures, in the "Surface result" shape of PRODUCT.md (plain arrays, JSON-safe).
 * Throws FrameError (with the field) for an invalid frame; MeshError when the frame cannot be meshed.
 */
export function solveFrame(frame: Readonly<Frame>, options: EngineOptions = {}): SurfaceResult {
  const { mesh, report } = createSurfaceSolver().solve(frame, options)
  const figures = computeFigures(mesh, frame, { residual: report.residual })
  const vertices: [number, number, number][] = []
  for (let v = 0; v < mesh.vertices.length; v += 3)
    vertices.push([mesh.vertices[v]!, mesh.vertices[v + 1]!, mesh.vertices[v + 2]!])
  const triangles: [number, number, number][] = []
  for (let t = 0; t < mesh.triangles.length; t += 3)
    triangles.push([mesh.triangles[t]!, mesh.triangles[t + 1]!, mesh.triangles[t + 2]!])
  return { vertices, triangles, figures, solver: report }
}
