/**
 * Scale of a site-plan underlay from two picked pixels and their known distance. Image pixels run
 * right and DOWN; plan y runs north (up the screen), hence the sign flip on y.
 */

export interface PixelPoint {
  x: number
  y: number
}

export interface UnderlayScale {
  /** Plan metres per image pixel. */
  metresPerPixel: number
  /** Image pixel that sits at plan (0, 0). */
  originX: number
  originY: number
}

/** A scale input that cannot work, naming the field and the reason. */
export class ScaleError extends Error {
  constructor(
    readonly field: 'a' | 'b' | 'distance',
    message: string,
  ) {
    super(message)
    this.name = 'ScaleError'
  }
}

/**
 * Metres per pixel from pixels `a`, `b` that are `distance` metres apart; the origin defaults to
 * `a`. Throws ScaleError for a missing, non-finite or non-positive distance, or points < 2 px apart
 * (a mis-click would give an absurd scale).
 */
export function scaleFromPoints(
  a: PixelPoint | null,
  b: PixelPoint | null,
  distance: number,
  origin: PixelPoint | null = a,
): UnderlayScale {
  if (!a) throw new ScaleError('a', 'Point A: click the first of two points whose distance you know.')
  if (!b) throw new ScaleError('b', 'Point B: click the second point.')
  if (!Number.isFinite(distance) || distance <= 0)
    throw new ScaleError('distance', 'Distance: give the real distance between A and B in metres (more than 0).')
  const px = Math.hypot(b.x - a.x, b.y - a.y)
  if (!(px >= 2))
    throw new ScaleError(
      'b',
      `Point B is ${px.toFixed(1)} px from A: pick two points at least 2 px apart, ideally far apart.`,
    )
  const o = origin ?? a
  return { metresPerPixel: distance / px, originX: o.x, originY: o.y }
}

/** Plan position (m) of an image pixel. */
export function pixelToPlan(p: PixelPoint, s: UnderlayScale): { x: number; y: number } {
  return { x: (p.x - s.originX) * s.metresPerPixel, y: -(p.y - s.originY) * s.metresPerPixel }
}

/** Image pixel of a plan position (m); inverse of pixelToPlan. */
export function planToPixel(p: { x: number; y: number }, s: UnderlayScale): PixelPoint {
  return { x: s.originX + p.x / s.metresPerPixel, y: s.originY - p.y / s.metresPerPixel }
}

/** Image pixel under a click on an element showing the image scaled to `shown` CSS pixels. */
export function clickToPixel(
  click: { offsetX: number; offsetY: number },
  shown: { width: number; height: number },
  natural: { width: number; height: number },
): PixelPoint {
  return { x: (click.offsetX * natural.width) / shown.width, y: (click.offsetY * natural.height) / shown.height }
}
