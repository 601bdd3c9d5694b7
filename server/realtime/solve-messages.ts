/** Messages between the solve pool (main thread) and its workers. Typed arrays travel transferred. */
import type { RoomCuts, RoomPatternPayload } from '../../shared/pattern/index.js'
import type { Surface } from '../../shared/protocol/index.js'
import type { Frame } from '../../shared/types.js'

export interface SolveJobMessage {
  type: 'solve'
  jobId: number
  roomId: string
  frame: Frame
  /** A quick preview at a larger element size; solved with its own (separate) warm state. */
  coarse: boolean
  /** The room's seams, checked: after a settled fine solve the worker lays the strips flat next. */
  cuts?: RoomCuts | undefined
  /** Int32Array(1) over this buffer: the pool writes 1 to cancel; the worker reads it as signal.aborted. */
  cancel: SharedArrayBuffer
}

export interface ForgetMessage {
  type: 'forget'
  roomId: string
}

export type ToWorker = SolveJobMessage | ForgetMessage

export type FromWorker =
  | { type: 'progress'; jobId: number; iteration: number; residual: number }
  /** `flattens`: a 'pattern' message for this job follows (the worker stays busy until it is sent). */
  | ({ type: 'result'; jobId: number; flattens: boolean } & Surface)
  /** The flat strips of the job's surface; undefined when the cancel flag stopped the flattening. */
  | { type: 'pattern'; jobId: number; pattern?: RoomPatternPayload | undefined }
  | { type: 'failed'; jobId: number; message: string }
