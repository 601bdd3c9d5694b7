/**
 * The `pattern` event: a room's flat patterns (PRODUCT.md "Cuts file and pattern result"), laid
 * out in the solve worker after a settled solve, or why there are none. Lengths in metres, strains
 * as fractions. Binary parts are packed into few typed arrays (socket.io-parser accepts at most 10
 * attachments per message).
 */
import { z } from 'zod'
import type { RoomPatternPayload } from '../pattern/room-pattern'
import type { PatternResult, StripPattern } from '../pattern/types'
import { float32Schema, uint32Schema } from './binary'
import type { VersionedSurface } from './surface'

export interface PatternEvent extends RoomPatternPayload {
  roomId: string
  version: number
}

/** The last settled surface with its pattern result when the room has seams (snapshots keep it). */
export interface SettledSurface extends VersionedSurface {
  pattern?: PatternResult
}

const num = z.number()
const uv = z.tuple([num, num])
const stripSchema = z.object({
  id: z.string(),
  outline: z.array(uv),
  cutLine: z.array(uv),
  area3d: num,
  areaFlat: num,
  length: num,
  width: num,
  overWidth: z.boolean(),
  strain: z.object({ maxWarp: num, maxFill: num, rms: num }),
  seams: z.array(z.object({ with: z.string(), length3d: num, lengthFlat: num, mismatch: num })),
}) satisfies z.ZodType<StripPattern>

export const patternResultSchema = z.object({
  strips: z.array(stripSchema),
  caution: z.string(),
}) satisfies z.ZodType<PatternResult>

const starts = z.array(z.number().int().nonnegative())

export const patternEventSchema = z
  .object({
    roomId: z.string(),
    version: z.number().int(),
    result: patternResultSchema.nullable(),
    error: z.object({ code: z.string(), field: z.string(), message: z.string() }).nullable(),
    settings: z.object({
      warpAngle: num,
      compensation: z.object({ warp: num, fill: num }),
      seamAllowance: num,
      rollWidth: num,
    }),
    flat: z.object({
      uv: float32Schema,
      triangles: uint32Schema,
      strain: float32Schema,
      vertexStart: starts,
      triangleStart: starts,
    }),
    cutVertices: float32Schema,
    cutTriangles: uint32Schema,
    triangleStrip: uint32Schema,
    dropped: z.number().int(),
    ms: num,
  })
  .superRefine((e, ctx) => {
    const { flat } = e
    const strips = e.result?.strips.length ?? 0
    if (flat.vertexStart.length !== strips + 1 || flat.triangleStart.length !== strips + 1) {
      ctx.addIssue({ code: 'custom', path: ['flat'], message: `needs ${strips + 1} strip starts` })
      return
    }
    if (2 * flat.vertexStart.at(-1)! !== flat.uv.length || 3 * flat.triangleStart.at(-1)! !== flat.triangles.length) {
      ctx.addIssue({ code: 'custom', path: ['flat'], message: 'array lengths do not match the strip starts' })
      return
    }
    for (let k = 0; k < strips; k++) {
      const n = flat.vertexStart[k + 1]! - flat.vertexStart[k]!
      for (let t = 3 * flat.triangleStart[k]!; t < 3 * flat.triangleStart[k + 1]!; t++) {
        if (flat.triangles[t]! >= n)
          return ctx.addIssue({
            code: 'custom',
            path: ['flat', 'triangles'],
            message: `index out of range in strip ${k + 1}`,
          })
      }
    }
    if (e.triangleStrip.length * 3 !== e.cutTriangles.length)
      ctx.addIssue({ code: 'custom', path: ['triangleStrip'], message: 'one strip per cut triangle' })
    for (const index of e.cutTriangles) {
      if (index * 3 >= e.cutVertices.length)
        return ctx.addIssue({ code: 'custom', path: ['cutTriangles'], message: 'vertex index out of range' })
    }
  }) satisfies z.ZodType<PatternEvent>
