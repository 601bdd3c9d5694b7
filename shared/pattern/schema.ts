/**
 * The cuts file and the surface file (only vertices and triangles are read) as zod schemas, and
 * their parsers, which turn the first problem into a PatternError naming the field.
 */
import { z } from 'zod'
import { fieldPath } from '../frame/parse-json'
import { PatternError } from './pattern-error'
import type { CutSettings, TriangleMesh } from './types'

export const MAX_SEAMS = 200
export const MAX_SURFACE_VERTICES = 500_000

const finite = z.number()
const point = z.tuple([finite, finite, finite])

export const planeSeamSchema = z.object({ kind: z.literal('plane'), point, normal: point })
export const geodesicSeamSchema = z.object({ kind: z.literal('geodesic'), from: point, to: point })
export const seamSchema = z.discriminatedUnion('kind', [planeSeamSchema, geodesicSeamSchema])

/** Everything but the header; the room's document carries these same settings. */
export const cutSettingsSchema = z.object({
  warpAngle: finite.min(-360).max(360).default(0),
  warpCentre: z.tuple([finite, finite]).optional(),
  compensation: z.object({ warp: finite.min(0).max(20), fill: finite.min(0).max(20) }).default({ warp: 0, fill: 0 }),
  seamAllowance: finite.min(0).max(1).default(0),
  rollWidth: finite.gt(0).max(20),
  seams: z.array(seamSchema).max(MAX_SEAMS),
})

export const cutsFileSchema = cutSettingsSchema.extend({
  format: z.literal('veilroom-cuts'),
  version: z.literal(1),
})

const surfaceFileSchema = z.object({
  vertices: z.array(point).min(3).max(MAX_SURFACE_VERTICES),
  triangles: z
    .array(z.tuple([z.int().min(0), z.int().min(0), z.int().min(0)]))
    .min(1)
    .max(2 * MAX_SURFACE_VERTICES),
})

function valueAt(input: unknown, path: readonly PropertyKey[]): unknown {
  let v = input
  for (const key of path) v = v !== null && typeof v === 'object' ? (v as Record<PropertyKey, unknown>)[key] : undefined
  return v
}

function errorFromIssue(issue: z.core.$ZodIssue, input: unknown, root: string): PatternError {
  const field = fieldPath(issue.path) === '(frame)' ? root : fieldPath(issue.path)
  const value = valueAt(input, issue.path)
  if (typeof value === 'number' && !Number.isFinite(value)) {
    return new PatternError('not-finite', `must be a finite number (got ${value})`, field)
  }
  if (issue.path.at(-1) === 'kind' || (issue.code === 'invalid_union' && issue.path.at(-2) === 'seams')) {
    return new PatternError(
      'unknown-seam-kind',
      `unknown seam kind ${JSON.stringify(valueAt(input, [...issue.path.slice(0, 2), 'kind']))}; use "plane" or "geodesic"`,
      field.endsWith('.kind') ? field : `${field}.kind`,
    )
  }
  if (
    issue.code === 'too_big' &&
    (issue.path.at(-1) === 'seams' || issue.path.at(-1) === 'vertices' || issue.path.at(-1) === 'triangles')
  ) {
    return new PatternError('too-large', issue.message, field)
  }
  return new PatternError('invalid-field', issue.message, field)
}

function parseJsonText(input: string | unknown): unknown {
  if (typeof input !== 'string') return input
  try {
    return JSON.parse(input)
  } catch (err) {
    throw new PatternError('invalid-json', `is not valid JSON (${(err as Error).message})`, '(file)')
  }
}

/** Checks a plane's normal, which zod cannot (non-zero length). */
function checkSeams(settings: CutSettings): CutSettings {
  settings.seams.forEach((seam, i) => {
    if (seam.kind === 'plane' && Math.hypot(...seam.normal) < 1e-12) {
      throw new PatternError('zero-normal', 'must not be the zero vector', `seams[${i}].normal`)
    }
  })
  return settings
}

/** Parse cut settings without a header (from the room's document). Throws PatternError. */
export function parseCutSettings(input: unknown): CutSettings {
  const parsed = cutSettingsSchema.safeParse(input)
  if (!parsed.success) throw errorFromIssue(parsed.error.issues[0]!, input, '(cuts)')
  return checkSeams(parsed.data)
}

/** Parse a cuts file (text or object). Throws PatternError naming the field. */
export function parseCutsFile(input: string | unknown): CutSettings {
  const data = parseJsonText(input)
  const parsed = cutsFileSchema.safeParse(data)
  if (!parsed.success) throw errorFromIssue(parsed.error.issues[0]!, data, '(cuts)')
  const { format: _format, version: _version, ...settings } = parsed.data
  return checkSeams(settings)
}

/** Parse a surface file (the solve CLI's output): vertices and triangles only. Throws PatternError. */
export function parseSurfaceFile(input: string | unknown): TriangleMesh {
  const data = parseJsonText(input)
  const parsed = surfaceFileSchema.safeParse(data)
  if (!parsed.success) throw errorFromIssue(parsed.error.issues[0]!, data, '(surface)')
  const { vertices, triangles } = parsed.data
  const mesh: TriangleMesh = {
    vertices: new Float64Array(vertices.flat()),
    triangles: new Uint32Array(triangles.flat()),
  }
  for (let t = 0; t < triangles.length; t++) {
    for (let k = 0; k < 3; k++) {
      if (triangles[t]![k]! >= vertices.length) {
        throw new PatternError(
          'index-out-of-range',
          `vertex index ${triangles[t]![k]} is not below the vertex count ${vertices.length}`,
          `triangles[${t}][${k}]`,
        )
      }
    }
  }
  return mesh
}
