/** Why a frame was refused. */
export type FrameErrorCode =
  | 'invalid-json'
  | 'invalid-field'
  | 'not-finite'
  | 'unknown-edge-kind'
  | 'too-few-points'
  | 'repeated-point'
  | 'duplicate-id'
  | 'degenerate-loop'
  | 'self-crossing'
  | 'hole-outside'
  | 'loops-crossing'
  | 'spatial-frame'
  | 'outer-loop-count'
  | 'cable-tension'
  | 'prestress'
  | 'edge-length'
  | 'too-many-points'
  | 'mesh-too-fine'
  | 'csv-syntax'

/**
 * A refused frame. `field` is a path into the frame file (`loops[1].points[3].x`) or, for CSV,
 * a place in the text (`line 7, column z`); the message says the reason in plain words.
 */
export class FrameError extends Error {
  constructor(
    readonly code: FrameErrorCode,
    /** The reason alone, without the field. */
    readonly reason: string,
    readonly field: string,
  ) {
    super(`${field}: ${reason}`)
    this.name = 'FrameError'
  }
}
