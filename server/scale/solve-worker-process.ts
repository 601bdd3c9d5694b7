/**
 * A solve worker process (`npm run worker`): serves the shared BullMQ queue and its own queue (rooms
 * whose warm state it holds), one job at a time per queue, solving in a small worker-thread pool.
 * It beats a heartbeat into Redis; when another worker's heartbeat stops, one live worker moves the
 * dead one's queued and running jobs to the shared queue (jobs on the shared queue come back through
 * BullMQ's own stalled-job check). A cancel message stops the room's running solve.
 */
import { Emitter } from '@socket.io/redis-emitter'
import { Queue, Worker, type Job } from 'bullmq'
import { logger } from '../lib/logger.js'
import { SolvePool, type SolveHandle } from '../realtime/solve-pool.js'
import { closeRedis, createRedis } from './redis.js'
import { runSolveJob, type JobOutcome } from './solve-job-runner.js'
import { HEARTBEAT_MS, SHARED_QUEUE, WORKER_ALIVE_MS, jobDataSchema, keys, workerQueue } from './solve-jobs.js'
import { rescueDeadWorkers } from './solve-rescue.js'

const STALE_MS = 250

export interface SolveWorkerOptions {
  redisUrl: string
  workerId: string
  /** Solver threads in this process. */
  threads: number
  /** BullMQ job lock, ms: a dead worker's shared-queue job is retried this long after its last renewal. */
  lockMs: number
  coarseAbove?: number
}

export interface SolveWorkerProcess {
  /** Jobs finished, by outcome (the benchmark reads them). */
  counts: Record<JobOutcome, number>
  close: () => Promise<void>
}

export async function startSolveWorker(opts: SolveWorkerOptions): Promise<SolveWorkerProcess> {
  const redis = createRedis(opts.redisUrl, `worker ${opts.workerId}`)
  const subscriber = createRedis(opts.redisUrl, `worker ${opts.workerId} cancel`)
  const emitter = new Emitter(redis)
  const pool = new SolvePool(opts.threads)
  pool.warmUp()
  const running = new Map<string, { handle: SolveHandle; at: number }>()
  const warm = new Map<string, string>()
  const counts: Record<JobOutcome, number> = { solved: 0, superseded: 0, cancelled: 0, invalid: 0, failed: 0 }

  await subscriber.subscribe(keys.cancel)
  // A solve younger than STALE_MS finishes (a drag would otherwise cancel every solve, as in one process).
  subscriber.on('message', (_channel: string, jobId: string) => {
    const run = running.get(jobId)
    if (run && performance.now() - run.at >= STALE_MS) run.handle.cancel()
  })

  const serve = async (job: Job): Promise<JobOutcome> => {
    const data = jobDataSchema.safeParse(job.data)
    if (!data.success) {
      logger.warn('worker: dropping a job with bad data', { jobId: job.id, issue: data.error.issues[0]?.message })
      return 'invalid'
    }
    const id = String(job.id)
    const outcome = await runSolveJob(id, data.data, {
      redis,
      emitter,
      pool,
      workerId: opts.workerId,
      warm,
      coarseAbove: opts.coarseAbove ?? 6000,
      onHandle: (handle) => (handle ? running.set(id, { handle, at: performance.now() }) : running.delete(id)),
    })
    counts[outcome]++
    return outcome
  }
  const workerOptions = {
    connection: createRedis(opts.redisUrl, `worker ${opts.workerId} bullmq`),
    concurrency: 1,
    lockDuration: opts.lockMs,
    stalledInterval: Math.max(500, Math.round(opts.lockMs / 2)),
    // A job whose worker died twice still gets a third try; a solve that crashes every worker does not loop forever.
    maxStalledCount: 2,
  }
  const workers = [
    new Worker(SHARED_QUEUE, serve, workerOptions),
    new Worker(workerQueue(opts.workerId), serve, workerOptions),
  ]
  for (const w of workers) w.on('error', (err) => logger.debug('worker: queue error', { err: String(err) }))
  const shared = new Queue(SHARED_QUEUE, { connection: redis })
  shared.on('error', (err) => logger.debug('worker: shared queue error', { err: String(err) }))

  const beat = async () => {
    try {
      await redis.hset(keys.workers, opts.workerId, String(Date.now()))
      await rescueDeadWorkers(redis, shared, opts.workerId)
    } catch (err) {
      logger.debug('worker: heartbeat failed', { err: String(err) })
    }
  }
  await beat()
  const timer = setInterval(() => void beat(), HEARTBEAT_MS)
  logger.info(`solve worker ${opts.workerId} ready`, { threads: opts.threads, aliveMs: WORKER_ALIVE_MS })

  return {
    counts,
    close: async () => {
      clearInterval(timer)
      for (const run of running.values()) run.handle.cancel()
      await Promise.all(workers.map((w) => w.close()))
      await shared.close()
      // A beat of 0 marks this worker dead at once, so a live one moves any jobs left on its queue.
      await redis.hset(keys.workers, opts.workerId, '0').catch(() => undefined)
      await pool.close()
      await closeRedis(subscriber)
      await closeRedis(workerOptions.connection)
      await closeRedis(redis)
    },
  }
}
