/**
 * Moves the jobs of a dead worker's own queue to the shared queue. Only that worker serves its
 * queue, so BullMQ's stalled-job check never runs there once it is gone; a live worker takes a
 * short Redis lock per dead worker, re-adds its waiting and running jobs (the newest-frame gate in
 * Redis still drops stale ones) and deletes the queue.
 */
import { Queue } from 'bullmq'
import type { Redis } from 'ioredis'
import { logger } from '../lib/logger.js'
import { JOB_NAME, WORKER_ALIVE_MS, keys, workerQueue } from './solve-jobs.js'

export async function rescueDeadWorkers(redis: Redis, shared: Queue, selfId: string): Promise<number> {
  const beats = await redis.hgetall(keys.workers)
  let moved = 0
  for (const [id, beat] of Object.entries(beats)) {
    if (id === selfId || Date.now() - Number(beat) < WORKER_ALIVE_MS) continue
    const locked = await redis.set(keys.rescue(id), selfId, 'PX', 15_000, 'NX')
    if (locked !== 'OK') continue
    const queue = new Queue(workerQueue(id), { connection: redis })
    queue.on('error', (err) => logger.debug('worker: rescue queue error', { err: String(err) }))
    try {
      const jobs = await queue.getJobs(['active', 'waiting', 'prioritized', 'delayed'])
      for (const job of jobs) {
        if (!job?.id) continue
        await shared.add(JOB_NAME, job.data, { jobId: job.id, removeOnComplete: true, removeOnFail: true, attempts: 3 })
        moved++
      }
      await queue.obliterate({ force: true })
      await redis.hdel(keys.workers, id)
      if (jobs.length)
        logger.info('worker: moved a dead worker’s jobs to the shared queue', { dead: id, jobs: jobs.length })
    } finally {
      await queue.close()
    }
  }
  return moved
}
