import { describe, expect, it } from 'vitest'
import type { SnapshotFigures } from '../../src/api/team'
import { figureDifferences, formatDiff } from '../../src/composables/use-compare'
import { legendMax, legendTicks, rampColours, DISTANCE_RAMP } from '../../src/composables/use-compare-colours'
import { vertexSlopes } from '../../src/lib/colour-maps'
import { nearestVertexDistances } from '../../src/composables/use-compare-distance'

/** Regular grid of n×n vertices over [0, size]² with z = f(x, y), two triangles per cell. */
function grid(n: number, size: number, f: (x: number, y: number) => number) {
  const vertices: number[] = []
  const triangles: number[] = []
  for (let j = 0; j < n; j++)
    for (let i = 0; i < n; i++) {
      const x = (i / (n - 1)) * size
      const y = (j / (n - 1)) * size
      vertices.push(x, y, f(x, y))
    }
  for (let j = 0; j + 1 < n; j++)
    for (let i = 0; i + 1 < n; i++) {
      const a = j * n + i
      triangles.push(a, a + 1, a + n + 1, a, a + n + 1, a + n)
    }
  return { vertices: Float64Array.from(vertices), triangles: Uint32Array.from(triangles) }
}

/** The definition of nearest-vertex distance, by brute force: the reference for the grid search. */
function bruteForce(from: ArrayLike<number>, to: ArrayLike<number>): number[] {
  const out: number[] = []
  for (let j = 0; j < to.length / 3; j++) {
    let best = Infinity
    for (let i = 0; i < from.length / 3; i++) {
      best = Math.min(
        best,
        Math.hypot(from[3 * i]! - to[3 * j]!, from[3 * i + 1]! - to[3 * j + 1]!, from[3 * i + 2]! - to[3 * j + 2]!),
      )
    }
    out.push(best)
  }
  return out
}

describe('nearest-vertex distance', () => {
  it('gives the offset d between two parallel copies of a plane (Euclidean distance, exact)', () => {
    const a = grid(21, 10, () => 0)
    const b = grid(21, 10, () => 0.35)
    const d = nearestVertexDistances(a.vertices, b.vertices)
    for (const v of d) expect(v).toBeCloseTo(0.35, 12)
  })

  it('gives 1 from the origin to points of the unit sphere (definition of the sphere)', () => {
    const sphere: number[] = []
    for (let k = 0; k < 200; k++) {
      const t = Math.acos(1 - (2 * (k + 0.5)) / 200)
      const p = k * 2.399963
      sphere.push(Math.sin(t) * Math.cos(p), Math.sin(t) * Math.sin(p), Math.cos(t))
    }
    const d = nearestVertexDistances([0, 0, 0], sphere)
    for (const v of d) expect(v).toBeCloseTo(1, 12)
  })

  it('agrees with brute force on random clouds, including points far outside the grid', () => {
    let seed = 7
    const rand = () => (seed = (seed * 16807) % 2147483647) / 2147483647
    const from = Array.from({ length: 900 }, (_, i) => (i % 3 === 2 ? rand() * 0.5 : rand() * 20))
    const to = Array.from({ length: 600 }, () => rand() * 40 - 10)
    const fast = Array.from(nearestVertexDistances(from, to))
    const slow = bruteForce(from, to)
    fast.forEach((v, i) => expect(v).toBeCloseTo(slow[i]!, 12))
  })

  it('gives Infinity when the other surface is empty', () => {
    expect(Array.from(nearestVertexDistances([], [1, 2, 3]))).toEqual([Infinity])
  })
})

describe('distance legend and colours', () => {
  // 1–2–5 steps for axis and legend maxima: common practice in chart scales.
  it('rounds the legend top up to 1, 2 or 5 × 10^k metres', () => {
    expect(legendMax([0.1873, 0.02])).toBeCloseTo(0.2, 12)
    expect(legendMax([0.31])).toBeCloseTo(0.5, 12)
    expect(legendMax([0.7])).toBeCloseTo(1, 12)
    expect(legendMax([1])).toBeCloseTo(1, 12)
    expect(legendMax([12])).toBeCloseTo(20, 12)
    expect(legendMax([0, Infinity])).toBe(0.001)
    expect(legendTicks(0.2)).toEqual([0, 0.05, 0.1, 0.15000000000000002, 0.2])
  })

  it('colours the ends of the ramp with its end stops, in linear RGB (IEC 61966-2-1)', () => {
    const c = rampColours([0, 0.5], 0.5, DISTANCE_RAMP)
    // #b4553d: r = 180/255 → linear ((0.70588 + 0.055) / 1.055)^2.4 = 0.45641
    expect(c[3]).toBeCloseTo(0.45641, 4)
    // #f3ead8: r = 243/255 → 0.89627
    expect(c[0]).toBeCloseTo(0.89627, 4)
  })
})

describe('vertex slopes', () => {
  it('is the plane angle everywhere on an inclined plane z = x·tan θ (exact for planes)', () => {
    for (const deg of [0, 12, 30, 55]) {
      const t = Math.tan((deg * Math.PI) / 180)
      const g = grid(6, 5, (x, y) => (x * 0.6 + y * 0.8) * t)
      for (const s of vertexSlopes(new Float64Array(g.vertices.length / 3), g.vertices, g.triangles))
        expect(s).toBeCloseTo(deg, 9)
    }
  })

  it('is zero at the saddle point of a hypar z = x·y / c (gradient vanishes there)', () => {
    const g = grid(11, 2, (x, y) => ((x - 1) * (y - 1)) / 1.5)
    const centre = 5 * 11 + 5
    expect(vertexSlopes(new Float64Array(g.vertices.length / 3), g.vertices, g.triangles)[centre]).toBeLessThan(1e-9)
  })
})

const figures = (o: Partial<SnapshotFigures>): SnapshotFigures => ({
  area: 0,
  planArea: 0,
  perimeter: 0,
  heightRange: [0, 0],
  slopeRange: [0, 0],
  flatShare: 0,
  ...o,
})

describe('figure differences', () => {
  // A flat 10 m × 10 m square: area = plan area = 100 m², perimeter 40 m (plane geometry, exact);
  // lifting one corner makes it a hypar with more fabric than plan.
  const flat = figures({
    area: 100,
    planArea: 100,
    perimeter: 40,
    heightRange: [0, 0],
    slopeRange: [0, 0],
    flatShare: 1,
    cables: [{ loop: 0, edge: 1, length: 10, force: 25 }],
  })
  const lifted = figures({
    area: 104.5,
    planArea: 100,
    perimeter: 41.2,
    heightRange: [0, 3],
    slopeRange: [2, 24],
    flatShare: 0.05,
    cables: [
      { loop: 0, edge: 1, length: 10.4, force: 25 },
      { loop: 0, edge: 3, length: 9.9, force: 18 },
    ],
  })
  const rows = figureDifferences(flat, lifted)
  const get = (key: string) => rows.find((r) => r.key === key)!

  it('gives B − A and the change relative to A', () => {
    expect(get('area')).toMatchObject({ a: 100, b: 104.5, unit: 'm²' })
    expect(get('area').diff).toBeCloseTo(4.5, 12)
    expect(get('area').relative).toBeCloseTo(0.045, 12)
    expect(get('planArea').diff).toBe(0)
    expect(get('heightMax').diff).toBe(3)
    expect(get('heightMax').relative).toBeNull()
    expect(
      figureDifferences(figures({ slopeRange: [0, 1e-13] }), figures({ slopeRange: [0, 2] })).find(
        (r) => r.key === 'slopeMax',
      )!.relative,
    ).toBeNull()
    expect(get('flatShare').diff).toBeCloseTo(-95, 9)
  })

  it('matches cables by loop and edge and marks a cable only one side has', () => {
    expect(get('cable0:1:length').diff).toBeCloseTo(0.4, 12)
    expect(get('cable0:3:force')).toMatchObject({ a: null, b: 18, diff: null })
    expect(get('cableCount')).toMatchObject({ a: 1, b: 2, diff: 1 })
  })

  it('formats signed differences', () => {
    expect(formatDiff(4.5)).toBe('+4.50')
    expect(formatDiff(-0.001)).toBe('0.00')
    expect(formatDiff(-2)).toBe('-2.00')
    expect(formatDiff(null)).toBe('—')
  })
})
