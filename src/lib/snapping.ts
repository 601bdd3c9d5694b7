/**
 * Grid snapping for frame points. Plan coordinates and heights snap to the same step (metres).
 * Results are rounded to whole micrometres so that 0.1-multiples print as 0.3, not 0.30000000000000004.
 */

/** Default grid step, metres. */
export const DEFAULT_SNAP_STEP = 0.1

const tidy = (v: number): number => Math.round(v * 1e6) / 1e6

/** Snaps one value to the nearest multiple of `step` (m); step ≤ 0 or non-finite leaves it unsnapped. */
export function snapValue(value: number, step: number): number {
  if (!(step > 0) || !Number.isFinite(step) || !Number.isFinite(value)) return value
  return tidy(Math.round(value / step) * step)
}

/** Snaps a plan position when `on`; otherwise only tidies floating noise. */
export function snapPlan(p: { x: number; y: number }, step: number, on: boolean): { x: number; y: number } {
  if (!on) return { x: tidy(p.x), y: tidy(p.y) }
  return { x: snapValue(p.x, step), y: snapValue(p.y, step) }
}

/**
 * New height after a vertical drag: moving the pointer up by `dyPixels` (screen pixels, down
 * positive as in DOM events) raises the point by dyPixels × metresPerPixel.
 */
export function heightFromDrag(
  startZ: number,
  dyPixels: number,
  metresPerPixel: number,
  step: number,
  on: boolean,
): number {
  const z = startZ - dyPixels * metresPerPixel
  return on ? snapValue(z, step) : tidy(z)
}
