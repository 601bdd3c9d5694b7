/**
 * `npm run worker`: a solve worker process for scale-out. Needs only Redis (REDIS_URL): jobs carry
 * their frame and results go to clients through Redis, so a worker may run on any machine that
 * reaches it. Environment: REDIS_URL (required), WORKER_ID (default host-pid), SOLVE_WORKERS
 * (threads, default 1), SOLVE_LOCK_MS (job lock, default 10000), LOG_LEVEL.
 */
import { hostname } from 'node:os'
import { z } from 'zod'
import { logger, setLogLevel } from './lib/logger.js'
import { startSolveWorker } from './scale/solve-worker-process.js'

const env = z
  .object({
    REDIS_URL: z.url().refine((u) => /^rediss?:\/\//.test(u), 'must start with redis:// or rediss://'),
    WORKER_ID: z
      .string()
      .regex(/^[A-Za-z0-9_.-]{1,64}$/, 'letters, digits, _ . - only (1–64)')
      .default(`${hostname()}-${process.pid}`),
    SOLVE_WORKERS: z.coerce.number().int().min(1, 'at least 1').max(64, 'at most 64').default(1),
    SOLVE_LOCK_MS: z.coerce.number().int().min(1000, 'at least 1000').max(600_000, 'at most 600000').default(10_000),
    LOG_LEVEL: z.enum(['debug', 'info', 'warn', 'error', 'silent']).default('info'),
  })
  .safeParse(process.env)
if (!env.success) {
  console.error(
    `Invalid configuration:\n${env.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n')}`,
  )
  process.exit(1)
}
setLogLevel(env.data.LOG_LEVEL)
const worker = await startSolveWorker({
  redisUrl: env.data.REDIS_URL,
  workerId: env.data.WORKER_ID,
  threads: env.data.SOLVE_WORKERS,
  lockMs: env.data.SOLVE_LOCK_MS,
})
const shutdown = (signal: string) => {
  logger.info(`${signal}: stopping solve worker ${env.data.WORKER_ID}`)
  worker.close().then(
    () => process.exit(0),
    () => process.exit(1),
  )
}
process.once('SIGINT', () => shutdown('SIGINT'))
process.once('SIGTERM', () => shutdown('SIGTERM'))
