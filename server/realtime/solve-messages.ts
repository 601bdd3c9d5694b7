/** Messages between the solve pool (main thread) and its workers. Typed arrays travel transferred. */
import type { Figures, Frame, SolverReport } from '../../shared/types.js'

export interface SolveJobMessage {
  type: 'solve'
  jobId: number
  roomId: string
  frame: Frame
  /** A quick preview at a larger element size; solved with its own (separate) warm state. */
  coarse: boolean
  /** Int32Array(1) over this buffer: the pool writes 1 to cancel; the worker reads it as signal.aborted. */
  cancel: SharedArrayBuffer
}

export interface ForgetMessage {
  type: 'forget'
  roomId: string
}

export type ToWorker = SolveJobMessage | ForgetMessage

export interface SurfacePayload {
  /** #V×3, metres. */
  vertices: Float32Array
  /** #T×3 vertex indices. */
  triangles: Uint32Array
  figures: Figures
  solver: SolverReport
}

export type FromWorker =
  | { type: 'progress'; jobId: number; iteration: number; residual: number }
  | ({ type: 'result'; jobId: number } & SurfacePayload)
  | { type: 'failed'; jobId: number; message: string }
