/**
 * The solved surface and the solver's state as they cross a wire (PRODUCT.md "Surface result"):
 * one set of types, with zod schemas that read them back. Units: metres; figures as in
 * shared/types.ts `Figures`.
 */
import { z } from 'zod'
import type { Figures, SolverReport, SolverState } from '../types'
import { float32Schema, uint32Schema, uint8Schema } from './binary'
import { solverReasonSchema, type SolverReason } from './solver-reasons'

/** A triangle mesh ready for three.js and the exports. */
export interface SurfaceMesh {
  /** #V×3, metres. */
  vertices: Float32Array
  /** #T×3 vertex indices. */
  triangles: Uint32Array
}

/** A solved surface: mesh, figures and the solver's report (what a solve worker returns). */
export interface Surface extends SurfaceMesh {
  figures: Figures
  solver: SolverReport
}

/** A surface solved from one version of a room's document (the last settled one is kept). */
export interface VersionedSurface extends Surface {
  version: number
}

/** The `surface` event: a room's surface as streamed. */
export interface SurfaceEvent extends VersionedSurface {
  roomId: string
  /** Y.encodeStateVector of the document the surface was solved from. */
  stateVector: Uint8Array
  /** True for a quick preview on a coarser mesh while the full solve runs. */
  coarse: boolean
}

/** The `solve:state` event. */
export interface SolveStateEvent {
  roomId: string
  version: number
  state: SolverState
  /** Why it is unsettled (words for people: solver-reasons.ts). */
  reason?: SolverReason
  /** Detail, e.g. the frame error's reason. */
  message?: string
  /** The frame field an invalid frame fails on. */
  field?: string
}

/** The `solve:progress` event. */
export interface SolveProgressEvent {
  roomId: string
  version: number
  iteration: number
  residual: number
}

const num = z.number()
const range = z.tuple([num, num])
const cableSchema = z.object({ loop: z.number().int(), edge: z.number().int(), length: num, force: num, sag: num })

export const figuresSchema = z.object({
  area: num,
  planArea: num,
  perimeter: num,
  cables: z.array(cableSchema),
  heightRange: range,
  slopeRange: range,
  slopeHistogram: z.object({ edges: z.array(num), shares: z.array(num) }),
  flatThreshold: num,
  flatShare: num,
  pondingPockets: z.array(z.object({ x: num, y: num, z: num, area: num })),
  anticlasticShare: num,
  reactions: z.array(z.tuple([num, num, num, num, num])),
  residual: num,
  minAngle: num,
}) satisfies z.ZodType<Figures>

/** The figures a snapshot list row carries (the snapshot itself keeps the full set). */
export const figuresSummarySchema = figuresSchema
  .pick({ area: true, planArea: true, perimeter: true, heightRange: true, slopeRange: true, flatShare: true })
  .extend({
    cableCount: z.number().int().optional(),
    cables: z.array(cableSchema.omit({ sag: true })).optional(),
  })
export type FiguresSummary = z.infer<typeof figuresSummarySchema>

export const solverReportSchema = z.object({
  method: z.string(),
  iterations: num,
  residual: num,
  converged: z.boolean(),
  reason: solverReasonSchema.optional(),
  ms: num,
  stressDeviation: z.object({ max: num, rms: num }).optional(),
}) satisfies z.ZodType<SolverReport>

/** Every triangle index names a vertex; lengths are whole #×3. */
function checkMesh(s: SurfaceMesh, ctx: z.core.$RefinementCtx): void {
  if (s.vertices.length % 3 !== 0)
    ctx.addIssue({ code: 'custom', path: ['vertices'], message: 'length is not a multiple of 3' })
  if (s.triangles.length % 3 !== 0)
    ctx.addIssue({ code: 'custom', path: ['triangles'], message: 'length is not a multiple of 3' })
  const count = Math.floor(s.vertices.length / 3)
  for (const index of s.triangles) {
    if (index >= count) {
      ctx.addIssue({
        code: 'custom',
        path: ['triangles'],
        message: `vertex index ${index} is out of range (${count} vertices)`,
      })
      return
    }
  }
}

/** A surface mesh sent as JSON arrays ([[x,y,z]…], [[i,j,k]…]), read into typed arrays. */
export const surfaceMeshJsonSchema = z
  .object({
    vertices: z.array(z.tuple([num, num, num])),
    triangles: z.array(
      z.tuple([z.number().int().nonnegative(), z.number().int().nonnegative(), z.number().int().nonnegative()]),
    ),
  })
  .transform((s): SurfaceMesh => ({
    vertices: Float32Array.from(s.vertices.flat()),
    triangles: Uint32Array.from(s.triangles.flat()),
  }))
  .superRefine(checkMesh)

export const surfaceEventSchema = z
  .object({
    roomId: z.string(),
    version: z.number().int(),
    stateVector: uint8Schema,
    coarse: z.boolean(),
    vertices: float32Schema,
    triangles: uint32Schema,
    figures: figuresSchema,
    solver: solverReportSchema,
  })
  .superRefine(checkMesh) satisfies z.ZodType<SurfaceEvent>

export const solveStateEventSchema = z.object({
  roomId: z.string(),
  version: z.number().int(),
  state: z.enum(['settling', 'settled', 'unsettled']),
  reason: solverReasonSchema.optional(),
  message: z.string().optional(),
  field: z.string().optional(),
}) satisfies z.ZodType<SolveStateEvent>

export const solveProgressEventSchema = z.object({
  roomId: z.string(),
  version: z.number().int(),
  iteration: num,
  residual: num,
}) satisfies z.ZodType<SolveProgressEvent>
