/**
 * Why a solve did not settle: the codes the engine and the solve loop send, and the words a person
 * reads for each. Raw codes stay in logs and files; the UI and the CLI show the words.
 */
import { z } from 'zod'

export const solverReasons = [
  'invalid-frame',
  'solver-error',
  'not-converged',
  'diverged',
  'no-equilibrium',
  'cancelled',
  'iteration-limit',
  'stalled',
  'line-search-failed',
  'unknown',
] as const
export type SolverReason = (typeof solverReasons)[number]

const words: Record<SolverReason, string> = {
  'invalid-frame': 'the frame is not valid',
  'solver-error': 'the solver stopped with an error',
  'not-converged': 'the solver did not settle',
  diverged: 'the shape ran away instead of settling',
  'no-equilibrium':
    'no equilibrium shape exists for this frame and these tensions (a neck pinches off or the surface collapses)',
  cancelled: 'a newer edit replaced this solve',
  'iteration-limit': 'the solver used all its iterations before settling',
  stalled: 'the solver stopped making progress before settling',
  'line-search-failed': 'the solver could not find a step that lowers the area',
  unknown: 'the solver stopped without settling',
}

/** A reason code read from outside; a code this version does not know becomes 'unknown'. */
export const solverReasonSchema = z.enum(solverReasons).catch('unknown')

/** The words shown for a reason; any code (known or not) gets words, never itself. */
export function reasonWords(reason: string | undefined): string {
  const parsed = solverReasonSchema.parse(reason ?? 'not-converged')
  return words[parsed]
}
