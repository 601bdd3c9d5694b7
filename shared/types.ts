/**
 * Types shared by the client, the server and the form-finding engine.
 * Units: lengths in metres, prestress in kN/m, cable tension in kN, angles in degrees unless named.
 */
import type { SolverReason } from './protocol/solver-reasons'

/** Kind of a frame edge: held in place, or a flexible cable of given tension. */
export type EdgeKind = 'rigid' | 'cable'

export interface FramePoint {
  id: string
  x: number
  y: number
  z: number
}

export interface FrameEdge {
  kind: EdgeKind
  /** Axial cable tension T in kN; present (and > 0) only for cable edges. */
  tension?: number
}

export interface FrameLoop {
  role: 'outer' | 'hole'
  points: FramePoint[]
  /** edges[i] joins points[i] to points[(i+1) % n]; same length as points. */
  edges: FrameEdge[]
}

/** A validated frame: the boundary of one membrane (see ../shared/PRODUCT.md "Frame file"). */
export interface Frame {
  format: 'veilroom-frame'
  version: 1
  units: 'm'
  /**
   * Membrane prestress, kN/m: warp along the warp direction, fill across it. warpAngle: the warp
   * direction in plan, degrees counter-clockwise from +x (0 by default; only its value mod 180
   * matters), projected onto the surface by the solver. warp = fill gives a minimal surface.
   */
  prestress: { warp: number; fill: number; warpAngle: number }
  mesh: { edgeLength: number }
  loops: FrameLoop[]
}

/** Solver state words used in UI and API. */
export type SolverState = 'settling' | 'settled' | 'unsettled'

export interface SolverReport {
  /** e.g. 'newton-height-field' or 'surface-stress-density' */
  method: string
  iterations: number
  /** Final residual: max nodal mean-curvature force, normalised (dimensionless). */
  residual: number
  converged: boolean
  /** Reason when not converged; the codes and their words are in shared/protocol/solver-reasons.ts. */
  reason?: SolverReason
  ms: number
  /**
   * Warp ≠ fill on the spatial path: how far the settled stresses are from the prescribed warp and
   * fill, % of the larger (max over faces, area-weighted RMS). 0 when warp = fill.
   */
  stressDeviation?: { max: number; rms: number }
}

export interface Histogram {
  /** Bin edges in degrees, length bins+1. */
  edges: number[]
  /** Share of surface area in each bin (sums to 1). */
  shares: number[]
}

export interface CableFigure {
  loop: number
  edge: number
  /** Length of the cable along the solved surface boundary, m. */
  length: number
  /** Axial force, kN. */
  force: number
  /** Largest sag from the chord, m. */
  sag: number
}

export interface Figures {
  area: number
  planArea: number
  perimeter: number
  cables: CableFigure[]
  heightRange: [number, number]
  /** Slope range of the surface in degrees from horizontal. */
  slopeRange: [number, number]
  slopeHistogram: Histogram
  /** Threshold in degrees below which a face counts as flat (default from common practice). */
  flatThreshold: number
  /** Share of area flatter than flatThreshold (0..1). */
  flatShare: number
  /** Interior low points that would hold water. */
  pondingPockets: { x: number; y: number; z: number; area: number }[]
  /** Share of area whose Gaussian curvature is negative (anticlastic), 0..1. */
  anticlasticShare: number
  /** Reaction at each frame point, kN, as [loop, point, fx, fy, fz]. */
  reactions: [number, number, number, number, number][]
  residual: number
  minAngle: number
}

/** The result shape of PRODUCT.md "Surface result" (JSON form). */
export interface SurfaceResult {
  vertices: [number, number, number][]
  triangles: [number, number, number][]
  figures: Figures
  solver: SolverReport
}

/**
 * A triangulated membrane ready for the solver (produced by shared/mesh, consumed by shared/solver).
 * vertices: #V×3 Float64Array, metres (boundary vertices carry the frame heights, interpolated
 * linearly along each edge; interior z is a first guess). triangles: #T×3 Uint32Array, counter-
 * clockwise seen from above for plan meshes.
 */
export interface MembraneMesh {
  vertices: Float64Array
  triangles: Uint32Array
  /** Per vertex: index of the frame loop it lies on, or -1 for interior vertices. */
  vertexLoops: Int32Array
  /** Per vertex: index of the frame edge (within its loop) it lies on, or -1. A frame point's vertex
   * reports the edge that starts at it. */
  vertexEdges: Int32Array
  /** Per vertex: index of the frame point (within its loop) it coincides with, or -1. */
  vertexPoints: Int32Array
  /** One array per frame loop: its boundary vertex indices in loop order (frame point 0 first). */
  boundaryLoops: Uint32Array[]
  /** Smallest triangle angle in degrees (in the meshing domain). */
  minAngle: number
  /** Equal for two meshes with identical connectivity: a solver may reuse its symbolic factorisation. */
  topologyKey: string
}
