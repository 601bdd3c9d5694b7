import type { ErrorRequestHandler, RequestHandler } from 'express'
import { ZodError } from 'zod'
import { AppError } from './app-error.js'
import { logger } from './logger.js'

interface ErrorBody {
  error: { code: string; message: string; field?: string }
}

// Body-parser and csrf-sync raise http-errors objects: recognise them by their fields.
interface HttpLikeError {
  status?: number
  statusCode?: number
  type?: string
  code?: string
  message?: string
  /** http-errors: true when the message is meant for the client. */
  expose?: boolean
  /** body-parser's charset.unsupported error names the charset it refused. */
  charset?: string
  /** TypeORM's QueryFailedError keeps the mysql2 error here. */
  driverError?: { code?: string }
}

// mysql2 / Node socket codes meaning "the database cannot be reached", not "the query was wrong".
const DB_DOWN = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EPIPE',
  'EHOSTUNREACH',
  'PROTOCOL_CONNECTION_LOST',
  'PROTOCOL_ENQUEUE_AFTER_FATAL_ERROR',
  'ER_SERVER_SHUTDOWN',
  'ER_CON_COUNT_ERROR',
])

function toResponse(err: unknown): { status: number; body: ErrorBody } {
  if (err instanceof AppError) {
    const { code, message, field } = err
    return { status: err.status, body: { error: field ? { code, message, field } : { code, message } } }
  }
  if (err instanceof ZodError) {
    const issue = err.issues[0]
    const field = issue?.path.join('.') || undefined
    const message = field ? `${field}: ${issue?.message}` : (issue?.message ?? 'Invalid input.')
    return {
      status: 400,
      body: { error: field ? { code: 'invalid_input', message, field } : { code: 'invalid_input', message } },
    }
  }
  const e = (err ?? {}) as HttpLikeError
  if (e.code === 'EBADCSRFTOKEN') {
    return {
      status: 403,
      body: {
        error: { code: 'csrf_invalid', message: 'Missing or wrong x-csrf-token header; fetch GET /api/auth/csrf.' },
      },
    }
  }
  if (e.type === 'entity.parse.failed') {
    return { status: 400, body: { error: { code: 'invalid_json', message: 'The request body is not valid JSON.' } } }
  }
  // Express's router decodes path parameters and marks a malformed %-sequence as a 400 URIError.
  if (err instanceof URIError) {
    return {
      status: 400,
      body: {
        error: {
          code: 'bad_url',
          message: 'The address holds a malformed percent-encoding: each % must start a %XX byte of valid UTF-8.',
        },
      },
    }
  }
  if (e.type === 'charset.unsupported') {
    const charset = String(e.charset ?? '').slice(0, 40)
    return {
      status: 400,
      body: {
        error: {
          code: 'unsupported_charset',
          message: `The request body's charset "${charset}" is not supported: send JSON as UTF-8.`,
        },
      },
    }
  }
  if (e.type === 'encoding.unsupported') {
    return {
      status: 400,
      body: {
        error: {
          code: 'unsupported_encoding',
          message: "The request body's Content-Encoding is not supported: send it as identity, gzip, deflate or br.",
        },
      },
    }
  }
  if (e.type === 'entity.too.large') {
    return { status: 413, body: { error: { code: 'too_large', message: 'The request body is too large.' } } }
  }
  if (DB_DOWN.has(e.code ?? e.driverError?.code ?? '')) {
    return {
      status: 503,
      body: {
        error: {
          code: 'db_unavailable',
          message: 'The database is not reachable right now; nothing was saved. Try again in a moment.',
        },
      },
    }
  }
  // Any other client error from the body parser or router: its status and its own (exposable) message.
  const status = e.status ?? e.statusCode ?? 500
  if (e.expose && status >= 400 && status < 500) {
    return {
      status,
      body: { error: { code: 'bad_request', message: String(e.message ?? 'Bad request.').slice(0, 200) } },
    }
  }
  return { status: 500, body: { error: { code: 'internal', message: 'Something went wrong on the server.' } } }
}

/** The single error middleware: every failure leaves as `{ error: { code, message, field? } }`. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const { status, body } = toResponse(err)
  if (status >= 500)
    logger.error('request failed', {
      method: req.method,
      url: req.originalUrl,
      err: String((err as Error)?.stack ?? err),
    })
  res.status(status).json(body)
}

/** Unknown /api paths answer JSON 404 instead of falling through to the SPA. */
export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json({ error: { code: 'not_found', message: `No API route ${req.method} ${req.path}.` } })
}
