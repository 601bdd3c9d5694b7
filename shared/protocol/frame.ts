/** A frame read from a reply or a message: the frame file's own parser and checks (shared/frame). */
import { z } from 'zod'
import { FrameError, parseFrameJson } from '../frame'
import type { Frame } from '../types'

/** Parses and validates a frame value; the issue names the frame field and the reason. */
export const frameSchema = z.unknown().transform((value, ctx): Frame => {
  try {
    return parseFrameJson(value)
  } catch (err) {
    if (!(err instanceof FrameError)) throw err
    ctx.addIssue({ code: 'custom', message: `${err.field}: ${err.reason}` })
    return z.NEVER
  }
})
