import { describe, expect, it } from 'vitest'
import { loopPointLabels } from '../../src/lib/report/labels'
import { cssString, pageStyle } from '../../src/lib/report/page-style'
import {
  backToFront,
  faceShades,
  faceSlopeAngles,
  planTransform,
  projectVertices,
  scaleBarLength,
  viewAxes,
} from '../../src/lib/report/projection'
import { planView, slopeMapView } from '../../src/lib/report/views'
import { structuredMesh } from '../helpers/meshes'

const dot = (a: readonly number[], b: readonly number[]) => a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!

describe('report projection', () => {
  it('view axes are orthonormal; from the south-west, right points south-east and up has a positive z', () => {
    const { right, up, towards } = viewAxes(225, 30)
    for (const [a, b] of [
      [right, up],
      [up, towards],
      [towards, right],
    ] as const)
      expect(dot(a, b)).toBeCloseTo(0, 12)
    for (const v of [right, up, towards]) expect(dot(v, v)).toBeCloseTo(1, 12)
    expect(right[0]).toBeCloseTo(Math.SQRT1_2, 12)
    expect(right[1]).toBeCloseTo(-Math.SQRT1_2, 12)
    expect(up[2]).toBeCloseTo(Math.cos(Math.PI / 6), 12)
    // a point nearer the viewer (south-west and up) has the larger depth
    const P = projectVertices([0, 0, 0, -1, -1, 1], { right, up, towards })
    expect(P[5]!).toBeGreaterThan(P[2]!)
  })

  it('paints far faces first: seen from straight above, the lower of two stacked triangles comes first', () => {
    const V = [0, 0, 2, 1, 0, 2, 0, 1, 2, 0, 0, 0, 1, 0, 0, 0, 1, 0]
    const order = backToFront(projectVertices(V, viewAxes(0, 90)), [0, 1, 2, 3, 4, 5])
    expect([...order]).toEqual([1, 0])
  })

  it('shades by Lambert’s cosine law and measures facet slopes from horizontal', () => {
    const tilted = [0, 0, 0, 1, 0, Math.tan(Math.PI / 6), 0, 1, 0] // z = x·tan 30°
    expect(faceSlopeAngles(tilted, [0, 1, 2])[0]).toBeCloseTo(30, 9)
    const flat = [0, 0, 0, 1, 0, 0, 0, 1, 0]
    expect(faceShades(flat, [0, 1, 2], [0, 0, 1], 0.3)[0]).toBeCloseTo(1, 12)
    expect(faceShades(flat, [0, 1, 2], [1, 0, 0], 0.3)[0]).toBeCloseTo(0.3, 12)
    expect(faceShades(flat, [0, 1, 2], [0, Math.SQRT1_2, Math.SQRT1_2], 0)[0]).toBeCloseTo(Math.SQRT1_2, 12)
  })

  it('plans north up at one scale in x and y, and picks a round scale bar', () => {
    const t = planTransform([10, 20, 0, 14, 22, 0], 400, 400, 20)
    expect(t.scale).toBeCloseTo(360 / 4, 12)
    expect(t.y(22)).toBeLessThan(t.y(20))
    expect(t.x(14) - t.x(10)).toBeCloseTo(4 * t.scale, 9)
    expect(t.height).toBeCloseTo(2 * t.scale + 40, 9)
    expect(scaleBarLength(12)).toBe(2)
    expect(scaleBarLength(40)).toBe(5)
    expect(scaleBarLength(0.9)).toBeCloseTo(0.1, 12)
  })
})

describe('report drawings', () => {
  it('spreads a small ring’s twelve labels on a circle wide enough for their width', () => {
    const xs = Array.from({ length: 12 }, (_, i) => 100 + 10 * Math.cos((i * Math.PI) / 6))
    const ys = Array.from({ length: 12 }, (_, i) => 100 + 10 * Math.sin((i * Math.PI) / 6))
    const labels = loopPointLabels(
      xs,
      ys,
      xs.map((_, i) => `H1 P${i + 1}`),
    )
    for (let i = 0; i < 12; i++) {
      const a = labels[i]!,
        b = labels[(i + 1) % 12]!
      expect(Math.hypot(a.label.x - b.label.x, a.label.y - b.label.y)).toBeGreaterThan(30)
      expect(a.leader).not.toBeNull()
    }
  })

  const frame = {
    prestress: { warp: 3, fill: 3 },
    mesh: { edgeLength: 1 },
    loops: [
      {
        role: 'outer' as const,
        points: [
          { id: 'a', x: 0, y: 0, z: 0 },
          { id: 'b', x: 4, y: 0, z: 0 },
          { id: 'c', x: 4, y: 4, z: 4 },
          { id: 'd', x: 0, y: 4, z: 0 },
        ],
        edges: Array.from({ length: 4 }, () => ({ kind: 'rigid' as const })),
      },
    ],
  }
  // the bilinear hypar z = x·y/4 through the four corners
  const hypar = structuredMesh(8, 8, (s, t) => [4 * s, 4 * t, 4 * s * t])
  // as the report receives it: a SurfaceMesh in single precision
  const mesh = { vertices: Float32Array.from(hypar.vertices), triangles: hypar.triangles }

  it('draws the plan with contours at the stated interval, labelled, and numbered pins', () => {
    const v = planView(
      mesh,
      frame,
      [
        { x: 1, y: 1 },
        { x: 3, y: 1 },
      ],
      600,
      600,
    )
    expect(v.interval).toBe(0.5)
    expect(v.contours.map((c) => c.level)).toEqual([0.5, 1, 1.5, 2, 2.5, 3, 3.5])
    expect(v.contourLabels.map((l) => l.text)).toEqual(['0.50', '1.00', '1.50', '2.00', '2.50', '3.00', '3.50'])
    expect(v.points.map((p) => p.label.text)).toEqual(['P1', 'P2', 'P3', 'P4'])
    expect(v.pins.map((p) => p.text)).toEqual(['1', '2'])
    // pins on one spot: the later discs move aside, clear of each other, with a leader to the point
    const stacked = planView(
      mesh,
      frame,
      [
        { x: 1, y: 1 },
        { x: 1, y: 1 },
        { x: 1, y: 1 },
      ],
      600,
      600,
    ).pins
    expect(stacked[0]!.leader).toBeNull()
    for (let i = 0; i < 3; i++)
      for (let j = 0; j < i; j++)
        expect(Math.hypot(stacked[i]!.x - stacked[j]!.x, stacked[i]!.y - stacked[j]!.y)).toBeGreaterThanOrEqual(17)
    expect(v.faces).toHaveLength(128)
  })

  it('classes the flat-area map by slope and gives each class its share of fabric area', () => {
    const v = slopeMapView(mesh, frame, 5, 400, 400)
    const total = v.classes.reduce((s, c) => s + c.share, 0)
    expect(total).toBeCloseTo(1, 12)
    expect(v.classes.map((c) => c.range)).toEqual(['under 5°', '5–10°', '10° and steeper'])
    expect(v.classes.some((c) => /drains|safe/i.test(c.label))).toBe(false)
  })
})

describe('report page style', () => {
  it('writes CSS strings with quotes, backslashes and line breaks escaped', () => {
    expect(cssString('Room "A" \\ B\nC')).toBe('"Room \\"A\\" \\\\ B\\A C"')
    const css = pageStyle({
      header: 'Veilroom report · “Sail”',
      date: 'Printed 2026-12-02',
      caution: 'Check "all" of it.',
    })
    expect(css).toContain('margin: 18mm 14mm 24mm 14mm;')
    expect(css).toContain('content: "Check \\"all\\" of it.";')
    expect(css).toContain('counter(page) " of " counter(pages)')
  })
})
