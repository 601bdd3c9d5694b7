/**
 * The frame file's shape (PRODUCT.md "Frame file") as a zod schema. Shape only: geometric checks
 * (crossings, holes, limits) live in validate.ts.
 */
import { z } from 'zod'

/** Defaults when a file leaves them out (CSV files never carry them). */
export const DEFAULT_PRESTRESS = 3 // kN/m, warp and fill
export const MAX_FRAME_POINTS = 2000
export const MAX_ESTIMATED_VERTICES = 100_000

const finite = z.number()

export const framePointSchema = z.object({
  id: z.string().min(1).max(64).optional(),
  x: finite,
  y: finite,
  z: finite,
})

export const frameEdgeSchema = z.object({
  kind: z.enum(['rigid', 'cable']),
  tension: finite.optional(),
})

export const frameLoopSchema = z.object({
  role: z.enum(['outer', 'hole']),
  points: z.array(framePointSchema).max(MAX_FRAME_POINTS),
  edges: z.array(frameEdgeSchema).optional(),
})

export const frameFileSchema = z.object({
  format: z.literal('veilroom-frame').optional(),
  version: z.literal(1).optional(),
  units: z.literal('m').optional(),
  prestress: z.object({ warp: finite, fill: finite, warpAngle: finite.optional() }).optional(),
  mesh: z.object({ edgeLength: finite }).optional(),
  loops: z.array(frameLoopSchema).min(1).max(64),
})

export type FrameFile = z.infer<typeof frameFileSchema>
