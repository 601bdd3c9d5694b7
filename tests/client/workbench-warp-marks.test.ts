import { describe, expect, it } from 'vitest'
import { MAX_WARP_MARKS, warpMarks } from '../../src/components/workbench/warp-marks'
import { structuredMesh } from '../helpers/meshes'

/** Unit direction of stroke k. */
function direction(marks: Float32Array, k: number): number[] {
  const d = [0, 1, 2].map((i) => marks[6 * k + 3 + i]! - marks[6 * k + i]!)
  const length = Math.hypot(...d)
  return d.map((c) => c / length)
}

describe('warp direction strokes on the surface', () => {
  it('follow the plan angle on a flat surface and its vertical projection on a slope', () => {
    // source: vertical projection of a plan direction (a, b) onto the plane z = x: (a, b, a)
    const flat = structuredMesh(4, 4, (s, t) => [4 * s, 4 * t, 1])
    const marks = warpMarks(flat.vertices, flat.triangles, 30)
    expect(marks.length).toBe(6 * (flat.triangles.length / 3))
    const d = direction(marks, 3)
    expect(d[0]).toBeCloseTo(Math.cos(Math.PI / 6), 6)
    expect(d[1]).toBeCloseTo(Math.sin(Math.PI / 6), 6)
    expect(d[2]).toBeCloseTo(0, 6)
    const slope = structuredMesh(4, 4, (s, t) => [4 * s, 4 * t, 4 * s])
    const up = direction(warpMarks(slope.vertices, slope.triangles, 0), 0)
    expect(up[0]).toBeCloseTo(Math.SQRT1_2, 5)
    expect(up[1]).toBeCloseTo(0, 5)
    expect(up[2]).toBeCloseTo(Math.SQRT1_2, 5)
    const across = direction(warpMarks(slope.vertices, slope.triangles, 90), 0)
    expect(across[2]).toBeCloseTo(0, 5)
  })

  it('draws at most MAX_WARP_MARKS strokes on a fine mesh', () => {
    const fine = structuredMesh(60, 60, (s, t) => [s, t, s * t])
    expect(warpMarks(fine.vertices, fine.triangles, 0).length / 6).toBeLessThanOrEqual(MAX_WARP_MARKS)
  })
})
