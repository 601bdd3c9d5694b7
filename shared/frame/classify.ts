/** Which solver path and mesher a valid frame needs (see validate.ts for the spatial rule). */
import type { Frame } from '../types'
import { loopPlan, loopStrictlyInside } from './loop-relations'

/** True when some hole overlaps the outer loop in plan (rings one above the other): meshParametric. */
export function frameNeedsParametricMesh(frame: Readonly<Frame>): boolean {
  const outer = frame.loops[0]
  if (!outer) return false
  const plan = loopPlan(outer)
  return frame.loops.slice(1).some((l) => !loopStrictlyInside(loopPlan(l), plan, 0))
}

/** True when any edge is a cable (its interior nodes move, so the surface is not a height field). */
export function frameHasCables(frame: Readonly<Frame>): boolean {
  return frame.loops.some((l) => l.edges.some((e) => e.kind === 'cable'))
}

/** True when the solver must use the 3D (spatial) path: cables, or loops overlapping in plan. */
export function frameNeedsSpatialSolve(frame: Readonly<Frame>): boolean {
  return frameHasCables(frame) || frameNeedsParametricMesh(frame)
}

/**
 * True when the surface can be sought as a height field z = u(x, y) over the plan domain (all edges
 * rigid, holes inside the outer loop in plan). Known limit: a height-field solve can still fail when
 * the true minimal surface turns vertical (steep mast rings); the solver then reports it.
 */
export function frameIsHeightField(frame: Readonly<Frame>): boolean {
  return !frameNeedsSpatialSolve(frame)
}
