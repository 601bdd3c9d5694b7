import { describe, expect, it } from 'vitest'
import { underlayPlacement } from '../../src/composables/use-viewport-underlay'

// Plain similar-triangle scaling: a pixel distance of d px standing for D m gives D/d m per pixel;
// image rows run down the page while plan y runs north, so the bottom-left pixel is the plan's
// lower-left corner (worked by hand for these round numbers).
describe('site plan underlay placement', () => {
  const meta = { ax: 0, ay: 0, bx: 100, by: 0, distance: 10, originX: 0, originY: 500, width: 1000, height: 500 }

  it('places a 1000×500 px plan at 0.1 m/px with its bottom-left pixel at plan (0, 0)', () => {
    const at = underlayPlacement(meta, 1000, 500)!
    expect(at.sizeX).toBeCloseTo(100, 12)
    expect(at.sizeY).toBeCloseTo(50, 12)
    expect(at.cx).toBeCloseTo(50, 12)
    expect(at.cy).toBeCloseTo(25, 12)
  })

  it('uses a diagonal pair of points (3-4-5 triangle) and a top-left origin', () => {
    const at = underlayPlacement({ ...meta, bx: 30, by: 40, distance: 5, originY: 0 }, 200, 100)!
    // 50 px stand for 5 m: 0.1 m/px; the image lies south of the origin (negative plan y)
    expect(at.sizeX).toBeCloseTo(20, 12)
    expect(at.sizeY).toBeCloseTo(10, 12)
    expect(at.cx).toBeCloseTo(10, 12)
    expect(at.cy).toBeCloseTo(-5, 12)
  })

  it('shows nothing for a scale that cannot work (zero distance, points on top of each other)', () => {
    expect(underlayPlacement({ ...meta, distance: 0 }, 1000, 500)).toBeNull()
    expect(underlayPlacement({ ...meta, bx: 0 }, 1000, 500)).toBeNull()
  })
})
