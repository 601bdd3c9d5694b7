/**
 * The engine as the live room uses it, in one place: frame validation (shared/frame) on the main
 * thread, and the stateful surface solver with figures (shared/engine, shared/figures) in the workers.
 */
import { FrameError, parseFrameJson } from '../../shared/frame/index.js'
export { estimatedVertices, frameMeshedArea } from '../../shared/frame/index.js'
export { frameStructureKey } from '../../shared/solver/index.js'
import type { Frame } from '../../shared/types.js'

export type FrameCheck = { ok: true; frame: Frame } | { ok: false; code: string; message: string; field?: string }

/**
 * Validates a frame read back from a room document (yjs keeps NaN and Infinity, so everything is
 * checked). Never throws for bad data: the reason goes to the room as an 'invalid-frame' state.
 */
export function validateRoomFrame(raw: unknown): FrameCheck {
  try {
    return { ok: true, frame: parseFrameJson(raw) }
  } catch (err) {
    if (err instanceof FrameError) return { ok: false, code: err.code, message: err.message, field: err.field }
    return { ok: false, code: 'invalid-field', message: err instanceof Error ? err.message : String(err) }
  }
}

export { createSurfaceSolver, type SurfaceSolver } from '../../shared/engine.js'
export { computeFigures } from '../../shared/figures/index.js'
