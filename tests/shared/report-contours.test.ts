import { describe, expect, it } from 'vitest'
import { contourInterval, contourLevels, contourSegments } from '../../shared/report'
import { structuredMesh } from '../helpers/meshes'

describe('report contours', () => {
  it('picks a round interval with at most ten steps over the height range', () => {
    expect(contourInterval(0, 3.2)).toBe(0.5)
    expect(contourInterval(-1, 0)).toBeCloseTo(0.1, 12)
    expect(contourInterval(2.1, 2.6)).toBeCloseTo(0.05, 12)
    expect(contourInterval(1, 13)).toBe(2)
    expect(contourInterval(4, 4)).toBeNull()
    expect(contourLevels(0, 3.2, 0.5)).toEqual([0.5, 1, 1.5, 2, 2.5, 3])
    expect(contourLevels(-0.25, 0.3, 0.1)).toEqual([-0.2, -0.1, 0, 0.1, 0.2])
  })

  it('is exact on a plane: every end point lies on the level line and the total length is the chord of the square (linear interpolation is exact for linear functions)', () => {
    // z = 0.3x − 0.2y + 1 over [2, 6]×[1, 5], on a lattice whose vertices fall on the level lines too.
    const mesh = structuredMesh(16, 16, (s, t) => [2 + 4 * s, 1 + 4 * t, 0.3 * (2 + 4 * s) - 0.2 * (1 + 4 * t) + 1])
    const level = 1.65
    const seg = contourSegments(mesh.vertices, mesh.triangles, level)
    expect(seg.length).toBeGreaterThan(0)
    let length = 0
    for (let i = 0; i < seg.length; i += 4) {
      for (const k of [i, i + 2]) expect(0.3 * seg[k]! - 0.2 * seg[k + 1]! + 1).toBeCloseTo(level, 12)
      length += Math.hypot(seg[i + 2]! - seg[i]!, seg[i + 3]! - seg[i + 1]!)
    }
    // 0.3x − 0.2y = 0.65 crosses y = 1 at x = 0.85/0.3 and y = 5 at x = 1.65/0.3 = 5.5, both inside.
    expect(length).toBeCloseTo(Math.hypot(5.5 - 0.85 / 0.3, 4), 9)
  })

  it('gives no segments for a level outside the surface', () => {
    const mesh = structuredMesh(4, 4, (s, t) => [s, t, s * t])
    expect(contourSegments(mesh.vertices, mesh.triangles, 1.5)).toEqual([])
  })
})
