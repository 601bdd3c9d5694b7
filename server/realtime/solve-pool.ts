/**
 * A pool of solve workers (worker_threads) with room affinity: a room's warm solver state lives in
 * one worker, so its jobs go there; when that worker is busy with another room an idle worker takes
 * the job cold (and becomes the room's home). Cancellation is cooperative through a shared flag.
 * A settled surface of a room with seams is laid flat afterwards in the same worker: the surface is
 * answered first, the pattern later; the room's next job stops a flattening still running.
 */
import { Worker } from 'node:worker_threads'
import type { RoomCuts, RoomPatternPayload } from '../../shared/pattern/index.js'
import type { Frame } from '../../shared/types.js'
import { logger } from '../lib/logger.js'
import type { Surface } from '../../shared/protocol/index.js'
import type { FromWorker, ToWorker } from './solve-messages.js'

export type SolveOutcome =
  | ({ kind: 'result'; worker: number } & Surface)
  /** `solver` is there when the worker answered: its reason says whether the engine saw the flag. */
  | { kind: 'cancelled'; solver?: Surface['solver'] }
  | { kind: 'failed'; message: string }

export interface SolveHandle {
  done: Promise<SolveOutcome>
  /** The flat strips laid out after `done`; null when none were asked for, or cancelled, or the job failed. */
  pattern: Promise<RoomPatternPayload | null>
  /** Asks the worker to stop at its next iteration; `done` then resolves 'cancelled'. */
  cancel: () => void
}

interface Job {
  id: number
  roomId: string
  frame: Frame
  coarse: boolean
  cuts: RoomCuts | undefined
  flag: Int32Array
  /** 'pattern': the surface is answered, the worker is laying the strips flat. */
  phase: 'solve' | 'pattern'
  onProgress: (iteration: number, residual: number) => void
  resolve: (o: SolveOutcome) => void
  resolvePattern: (p: RoomPatternPayload | null) => void
}

interface Slot {
  worker: Worker
  job: Job | null
}

const workerUrl = new URL('./solve-worker-boot.mjs', import.meta.url)

export class SolvePool {
  private readonly slots: (Slot | null)[]
  private readonly home = new Map<string, number>()
  private queue: Job[] = []
  private nextId = 1
  private closed = false

  constructor(readonly size: number) {
    if (!Number.isInteger(size) || size < 1) throw new Error(`solve pool size: must be a whole number ≥ 1, got ${size}`)
    this.slots = Array.from({ length: size }, () => null)
  }

  /** Queues a solve of `frame` for a room. */
  solve(
    roomId: string,
    frame: Frame,
    opts: { coarse?: boolean; onProgress?: Job['onProgress']; cuts?: RoomCuts | undefined } = {},
  ): SolveHandle {
    const flag = new Int32Array(new SharedArrayBuffer(4))
    let resolve!: (o: SolveOutcome) => void
    const done = new Promise<SolveOutcome>((r) => (resolve = r))
    let resolvePattern!: (p: RoomPatternPayload | null) => void
    const pattern = new Promise<RoomPatternPayload | null>((r) => (resolvePattern = r))
    const job: Job = {
      id: this.nextId++,
      roomId,
      frame,
      coarse: opts.coarse ?? false,
      cuts: opts.cuts,
      flag,
      phase: 'solve',
      onProgress: opts.onProgress ?? (() => undefined),
      resolve,
      resolvePattern,
    }
    if (this.closed) this.settle(job, { kind: 'cancelled' })
    else {
      this.queue.push(job)
      this.dispatch()
    }
    const cancel = () => {
      Atomics.store(flag, 0, 1)
      const queued = this.queue.indexOf(job)
      if (queued >= 0) {
        this.queue.splice(queued, 1)
        this.settle(job, { kind: 'cancelled' })
      }
    }
    return { done, pattern, cancel }
  }

  /** Starts every worker now, so the first edit does not wait for a worker to boot. */
  warmUp(): void {
    for (let i = 0; i < this.size; i++) if (!this.slots[i] && !this.closed) this.spawn(i)
  }

  /** Drops a room's warm state (its document was freed). */
  forget(roomId: string): void {
    const index = this.home.get(roomId)
    this.home.delete(roomId)
    if (index !== undefined) this.slots[index]?.worker.postMessage({ type: 'forget', roomId } satisfies ToWorker)
  }

  /** Jobs waiting and running, for the benchmark. */
  load(): { queued: number; running: number } {
    return { queued: this.queue.length, running: this.slots.filter((s) => s?.job).length }
  }

  async close(): Promise<void> {
    this.closed = true
    for (const job of this.queue) this.settle(job, { kind: 'cancelled' })
    this.queue = []
    await Promise.all(
      this.slots.map(async (slot) => {
        if (!slot) return
        if (slot.job) Atomics.store(slot.job.flag, 0, 1)
        await slot.worker.terminate()
      }),
    )
  }

  private dispatch(): void {
    for (let i = 0; i < this.queue.length;) {
      const job = this.queue[i]!
      const target = this.pick(job.roomId)
      if (target === undefined) {
        i++
        continue
      }
      this.queue.splice(i, 1)
      this.run(target, job)
    }
  }

  /** The worker index to run a room's job on now, or undefined to keep it queued. */
  private pick(roomId: string): number | undefined {
    const idle = (i: number) => !this.slots[i]?.job
    const home = this.home.get(roomId)
    if (home !== undefined) {
      if (idle(home)) return home
      // A cancelled job of the same room is about to end there: wait for it and stay warm.
      const running = this.slots[home]?.job
      if (running?.roomId === roomId) {
        // a newer job of the room makes the flattening of an older surface moot: stop it
        if (running.phase === 'pattern') Atomics.store(running.flag, 0, 1)
        return undefined
      }
    }
    const free = this.slots.map((_, i) => i).filter(idle)
    if (free.length === 0) return undefined
    // Prefer a worker that is home to the fewest rooms so warm states spread out.
    const homes = (i: number) => [...this.home.values()].filter((h) => h === i).length
    free.sort((a, b) => homes(a) - homes(b))
    return free[0]
  }

  private run(index: number, job: Job): void {
    const slot = this.slots[index] ?? this.spawn(index)
    const previous = this.home.get(job.roomId)
    if (previous !== undefined && previous !== index)
      this.slots[previous]?.worker.postMessage({ type: 'forget', roomId: job.roomId } satisfies ToWorker)
    this.home.set(job.roomId, index)
    slot.job = job
    // Only an idle pool may let the process exit.
    slot.worker.ref()
    const message: ToWorker = {
      type: 'solve',
      jobId: job.id,
      roomId: job.roomId,
      frame: job.frame,
      coarse: job.coarse,
      cuts: job.cuts,
      cancel: job.flag.buffer as SharedArrayBuffer,
    }
    slot.worker.postMessage(message)
  }

  private spawn(index: number): Slot {
    // The boot file registers tsx, so the worker imports the TypeScript engine directly.
    const worker = new Worker(workerUrl)
    const slot: Slot = { worker, job: null }
    this.slots[index] = slot
    worker.on('message', (m: FromWorker) => this.onMessage(slot, m))
    const stopped = (): SolveOutcome =>
      this.closed ? { kind: 'cancelled' } : { kind: 'failed', message: 'the solver stopped unexpectedly' }
    worker.on('error', (err) => {
      logger.error('realtime: solve worker crashed', { err: String(err) })
      this.finish(slot, stopped())
    })
    worker.on('exit', () => {
      if (this.slots[index] !== slot) return
      this.slots[index] = null
      for (const [room, home] of this.home) if (home === index) this.home.delete(room)
      if (slot.job) this.finish(slot, stopped())
    })
    worker.unref()
    return slot
  }

  private onMessage(slot: Slot, m: FromWorker): void {
    const job = slot.job
    if (!job || job.id !== m.jobId) return
    const cancelled = Atomics.load(job.flag, 0) !== 0
    if (m.type === 'progress') job.onProgress(m.iteration, m.residual)
    else if (m.type === 'failed') this.finish(slot, { kind: 'failed', message: m.message })
    else if (m.type === 'pattern') this.finish(slot, undefined, cancelled ? null : (m.pattern ?? null))
    else {
      const { type: _t, jobId: _j, flattens, ...payload } = m
      const worker = this.slots.indexOf(slot)
      const outcome: SolveOutcome = cancelled
        ? { kind: 'cancelled', solver: payload.solver }
        : { kind: 'result', worker, ...payload }
      if (!flattens) return this.finish(slot, outcome)
      // the worker stays busy with this job until its 'pattern' message (a queued job of the room stops it)
      job.phase = 'pattern'
      job.resolve(outcome)
      this.dispatch()
    }
  }

  /** Ends the slot's job: resolves what is still open (outcome, then pattern) and frees the worker. */
  private finish(slot: Slot, outcome?: SolveOutcome, pattern: RoomPatternPayload | null = null): void {
    const job = slot.job
    slot.job = null
    slot.worker.unref()
    if (job) this.settle(job, outcome, pattern)
    if (!this.closed) this.dispatch()
  }

  /** Resolves a job's promises (a promise already resolved keeps its first value). */
  private settle(job: Job, outcome?: SolveOutcome, pattern: RoomPatternPayload | null = null): void {
    if (outcome) job.resolve(outcome)
    job.resolvePattern(pattern)
  }
}
