// A small leveled logger: one line per event, ISO time first, so logs sort and grep well.
const levels = { debug: 10, info: 20, warn: 30, error: 40, silent: 100 } as const
export type LogLevel = keyof typeof levels

let threshold: number = levels[(process.env.LOG_LEVEL as LogLevel | undefined) ?? 'info'] ?? levels.info

export function setLogLevel(level: LogLevel): void {
  threshold = levels[level]
}

function write(level: Exclude<LogLevel, 'silent'>, message: string, extra?: Record<string, unknown>): void {
  if (levels[level] < threshold) return
  const tail = extra ? ' ' + JSON.stringify(extra) : ''
  const line = `${new Date().toISOString()} ${level.toUpperCase().padEnd(5)} ${message}${tail}`
  if (level === 'error' || level === 'warn') console.error(line)
  else console.log(line)
}

export const logger = {
  debug: (message: string, extra?: Record<string, unknown>) => write('debug', message, extra),
  info: (message: string, extra?: Record<string, unknown>) => write('info', message, extra),
  warn: (message: string, extra?: Record<string, unknown>) => write('warn', message, extra),
  error: (message: string, extra?: Record<string, unknown>) => write('error', message, extra),
}
