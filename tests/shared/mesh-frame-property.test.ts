import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { loopSignedArea, meshFrame } from '../../shared/mesh'
import { parseFrameJson } from '../../shared/frame'

// Random star-shaped outer loops (always simple) with an optional small hole at the centre:
// whatever the shape, the mesh must tile the domain exactly and keep the topology of the domain.
const starFrame = fc.record({
  radii: fc.array(fc.double({ min: 2, max: 6, noNaN: true }), { minLength: 3, maxLength: 14 }),
  heights: fc.array(fc.double({ min: -2, max: 4, noNaN: true }), { minLength: 14, maxLength: 14 }),
  hole: fc.boolean(),
  h: fc.double({ min: 0.25, max: 0.8, noNaN: true }),
  cx: fc.double({ min: -50, max: 50, noNaN: true }),
})

describe('meshFrame on random star-shaped frames', () => {
  it('tiles the domain (areas add up), V − E + F = 1 − holes, all faces counter-clockwise', () => {
    fc.assert(
      fc.property(starFrame, ({ radii, heights, hole, h, cx }) => {
        const n = radii.length
        const outer = radii.map((r, i) => ({
          x: cx + r * Math.cos((2 * Math.PI * i) / n),
          y: r * Math.sin((2 * Math.PI * i) / n),
          z: heights[i]!,
        }))
        const ring = Array.from({ length: 6 }, (_, i) => ({
          x: cx + 0.8 * Math.cos((-2 * Math.PI * i) / 6),
          y: 0.8 * Math.sin((-2 * Math.PI * i) / 6),
          z: 3,
        }))
        const frame = parseFrameJson({
          mesh: { edgeLength: h },
          loops: [{ role: 'outer', points: outer }, ...(hole ? [{ role: 'hole', points: ring }] : [])],
        })
        const m = meshFrame(frame)
        const nV = m.vertices.length / 3
        const edges = new Set<number>()
        let area = 0
        for (let t = 0; t < m.triangles.length; t += 3) {
          const [a, b, c] = [0, 1, 2].map((k) => 3 * m.triangles[t + k]!) as [number, number, number]
          const s =
            0.5 *
            ((m.vertices[b]! - m.vertices[a]!) * (m.vertices[c + 1]! - m.vertices[a + 1]!) -
              (m.vertices[b + 1]! - m.vertices[a + 1]!) * (m.vertices[c]! - m.vertices[a]!))
          expect(s).toBeGreaterThan(0)
          area += s
          for (let k = 0; k < 3; k++) {
            const p = m.triangles[t + k]!,
              q = m.triangles[t + ((k + 1) % 3)]!
            edges.add(Math.min(p, q) * nV + Math.max(p, q))
          }
        }
        const flat = (pts: { x: number; y: number }[]) => Float64Array.from(pts.flatMap((p) => [p.x, p.y]))
        const expected = Math.abs(loopSignedArea(flat(outer))) - (hole ? Math.abs(loopSignedArea(flat(ring))) : 0)
        // shoelace formula: the triangles' areas sum to the polygon's area
        expect(area).toBeCloseTo(expected, 8)
        // Euler–Poincaré for a disc with holes
        expect(nV - edges.size + m.triangles.length / 3).toBe(hole ? 0 : 1)
      }),
      { numRuns: 60, seed: 20261202, endOnFailure: true },
    )
  })
})
