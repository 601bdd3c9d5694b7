/**
 * Last line of defence: an exception that escapes a timer, socket or stream callback would end
 * Node (and with it every room on this server). Each reader of outside data handles its own errors;
 * this logs whatever still slips through, with its stack, and keeps serving. The faulty message or
 * room has already been dropped by the time the exception reaches here, because the callback that
 * threw has ended.
 */
import { logger } from './logger.js'

let installed = false

/** Installs the process-wide handlers once (later calls do nothing). */
export function installProcessGuards(): void {
  if (installed) return
  installed = true
  process.on('uncaughtException', (err, origin) => {
    logger.error('uncaught exception (kept serving)', {
      origin,
      err: String(err),
      stack: err instanceof Error ? err.stack : undefined,
    })
  })
  process.on('unhandledRejection', (reason) => {
    logger.error('unhandled rejection (kept serving)', {
      err: String(reason),
      stack: reason instanceof Error ? reason.stack : undefined,
    })
  })
}
