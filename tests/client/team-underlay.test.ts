import { describe, expect, it } from 'vitest'
import {
  clickToPixel,
  pixelToPlan,
  planToPixel,
  scaleFromPoints,
  ScaleError,
} from '../../src/components/team/underlay-scale'

describe('underlay scale from two picked points', () => {
  it('divides the known distance by the pixel distance (3-4-5 right triangle: 30, 40 → 50 px)', () => {
    const s = scaleFromPoints({ x: 100, y: 200 }, { x: 130, y: 240 }, 25)
    expect(s.metresPerPixel).toBeCloseTo(0.5, 12)
    expect([s.originX, s.originY]).toEqual([100, 200])
  })

  it('maps pixels to plan metres with y north (image rows run down) and back', () => {
    const s = scaleFromPoints({ x: 0, y: 0 }, { x: 200, y: 0 }, 10, { x: 50, y: 400 })
    expect(pixelToPlan({ x: 250, y: 300 }, s)).toEqual({ x: 10, y: 5 })
    const back = planToPixel({ x: 10, y: 5 }, s)
    expect(back.x).toBeCloseTo(250, 9)
    expect(back.y).toBeCloseTo(300, 9)
  })

  it('turns a click on a shrunken image into natural pixels', () => {
    expect(
      clickToPixel({ offsetX: 100, offsetY: 50 }, { width: 400, height: 200 }, { width: 1600, height: 800 }),
    ).toEqual({ x: 400, y: 200 })
  })

  it('names the field at fault', () => {
    const field = (f: () => unknown) => {
      try {
        f()
      } catch (err) {
        return err instanceof ScaleError ? err.field : 'other'
      }
      return 'none'
    }
    expect(field(() => scaleFromPoints(null, { x: 1, y: 1 }, 5))).toBe('a')
    expect(field(() => scaleFromPoints({ x: 1, y: 1 }, null, 5))).toBe('b')
    expect(field(() => scaleFromPoints({ x: 0, y: 0 }, { x: 10, y: 0 }, 0))).toBe('distance')
    expect(field(() => scaleFromPoints({ x: 0, y: 0 }, { x: 10, y: 0 }, Number.NaN))).toBe('distance')
    expect(field(() => scaleFromPoints({ x: 0, y: 0 }, { x: 1, y: 0 }, 5))).toBe('b')
  })
})
