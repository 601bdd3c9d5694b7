import type { RequestHandler } from 'express'
import { AppError } from './app-error.js'

/** No request body of ours nests deeper than a handful of levels; 32 leaves room to spare. */
export const MAX_JSON_DEPTH = 32

/**
 * Refuses a parsed JSON body that nests deeper than `max` (400 too_deep, naming the top-level
 * field it sits under). JSON.parse itself takes any depth, but code after it may recurse (String()
 * of an array, formatting, logging) and overflow the stack: a 500 with a trace in the log for a
 * 1 MB body of brackets. The walk keeps its own stack, so it cannot overflow.
 */
export function jsonDepthLimit(max = MAX_JSON_DEPTH): RequestHandler {
  return (req, _res, next) => {
    const body: unknown = req.body
    if (body === null || typeof body !== 'object') return next()
    const stack: { value: object; depth: number; field: string | undefined }[] = [
      { value: body, depth: 1, field: undefined },
    ]
    while (stack.length) {
      const { value, depth, field } = stack.pop()!
      if (depth > max) {
        const where = field === undefined ? 'The JSON body' : `${field}: the value`
        return next(
          new AppError('too_deep', 400, `${where} nests more than ${max} levels of arrays or objects.`, field),
        )
      }
      for (const [key, child] of Object.entries(value)) {
        if (child !== null && typeof child === 'object')
          stack.push({ value: child as object, depth: depth + 1, field: field ?? key })
      }
    }
    next()
  }
}
