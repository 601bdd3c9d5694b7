/** Reading a frame file (JSON text or an already parsed object) into a validated Frame. */
import type { z } from 'zod'
import type { Frame } from '../types'
import { FrameError } from './frame-error'
import { normaliseFrameFile } from './normalise'
import { frameFileSchema } from './schema'
import { validateFrame } from './validate'

/** `['loops', 1, 'points', 3, 'x']` → `loops[1].points[3].x`. */
export function fieldPath(path: readonly PropertyKey[]): string {
  let out = ''
  for (const key of path) out += typeof key === 'number' ? `[${key}]` : `${out ? '.' : ''}${String(key)}`
  return out || '(frame)'
}

function valueAt(input: unknown, path: readonly PropertyKey[]): unknown {
  let v = input
  for (const key of path) v = v !== null && typeof v === 'object' ? (v as Record<PropertyKey, unknown>)[key] : undefined
  return v
}

/** Turn the first zod issue into a FrameError with our codes and plain reasons. */
export function frameErrorFromIssue(issue: z.core.$ZodIssue, input: unknown): FrameError {
  const field = fieldPath(issue.path)
  const value = valueAt(input, issue.path)
  if (typeof value === 'number' && !Number.isFinite(value)) {
    return new FrameError('not-finite', `must be a finite number (got ${value})`, field)
  }
  if (issue.path.at(-1) === 'kind' && issue.code === 'invalid_value') {
    return new FrameError(
      'unknown-edge-kind',
      `unknown edge kind ${JSON.stringify(value)}; use "rigid" or "cable"`,
      field,
    )
  }
  if (issue.code === 'too_big' && issue.path.at(-1) === 'points') {
    return new FrameError('too-many-points', issue.message, field)
  }
  return new FrameError('invalid-field', issue.message, field)
}

/** Parse and validate a frame file. Throws FrameError (code, message, field) on any problem. */
export function parseFrameJson(input: string | unknown): Frame {
  let data: unknown = input
  if (typeof input === 'string') {
    try {
      data = JSON.parse(input)
    } catch (err) {
      throw new FrameError('invalid-json', `is not valid JSON (${(err as Error).message})`, '(file)')
    }
  }
  const parsed = frameFileSchema.safeParse(data)
  if (!parsed.success) throw frameErrorFromIssue(parsed.error.issues[0]!, data)
  return validateFrame(normaliseFrameFile(parsed.data))
}
