/** Why a cuts file, a surface file or a cut was refused. */
export type PatternErrorCode =
  | 'invalid-json'
  | 'invalid-field'
  | 'not-finite'
  | 'unknown-seam-kind'
  | 'zero-normal'
  | 'index-out-of-range'
  | 'too-large'
  | 'seam-misses-surface'
  | 'geodesic-not-traced'
  | 'degenerate-strip'
  | 'cancelled'

/** A refused input. `field` is a path into the file (`seams[2].normal`); `reason` is plain words. */
export class PatternError extends Error {
  constructor(
    readonly code: PatternErrorCode,
    readonly reason: string,
    readonly field: string,
  ) {
    super(`${field}: ${reason}`)
    this.name = 'PatternError'
  }
}
