// Abuse limits, one shape for all: express-rate-limit's memory store, counted per process, and a
// 429 in our error shape. Behind several processes each keeps its own count (a shared store would
// be the next step).
import type { Request, RequestHandler } from 'express'
import { ipKeyGenerator, rateLimit } from 'express-rate-limit'

export const HOUR_MS = 60 * 60 * 1000

export interface LimitOptions {
  /** What is counted, for the 429 message: "sign-ups from this address". */
  what: string
  limit: number
  windowMs: number
  /** Counts per client address, per signed-in user, or per address + something from the request. */
  key: 'ip' | 'user' | ((req: Request) => string)
  /** Count only failed requests (status ≥ 400), as for sign-in. */
  failuresOnly?: boolean
}

const ipOf = (req: Request) => ipKeyGenerator(req.ip ?? '')

const minutes = (ms: number) =>
  ms >= HOUR_MS ? `${Math.round(ms / HOUR_MS)} hour${ms === HOUR_MS ? '' : 's'}` : `${Math.round(ms / 60_000)} minutes`

/** A limiter answering 429 rate_limited with a message naming what was counted and the window. */
export function limiter({ what, limit, windowMs, key, failuresOnly = false }: LimitOptions): RequestHandler {
  return rateLimit({
    windowMs,
    limit,
    skipSuccessfulRequests: failuresOnly,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator:
      key === 'ip' ? ipOf : key === 'user' ? (req) => (req.user ? `user:${req.user.id}` : `ip:${ipOf(req)}`) : key,
    handler: (_req, res) => {
      res.status(429).json({
        error: {
          code: 'rate_limited',
          message: `Too many ${what} (at most ${limit} in ${minutes(windowMs)}); try again later.`,
        },
      })
    },
  })
}

export { ipOf }
