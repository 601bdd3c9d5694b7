import { describe, expect, it } from 'vitest'
import { meshFrame, pointInLoop, loopSignedArea } from '../../shared/mesh'
import { frameToJson, parseFrameJson } from '../../shared/frame'
import type { Frame, MembraneMesh } from '../../shared/types'
import { circleLoop, frame, squareLoop, type Pt } from './frame-fixtures'

const flat = (pts: Pt[]) => Float64Array.from(pts.flatMap((p) => [p.x, p.y]))

function edgeCount(m: MembraneMesh): number {
  const edges = new Set<number>()
  const nV = m.vertices.length / 3
  for (let t = 0; t < m.triangles.length; t += 3) {
    for (let k = 0; k < 3; k++) {
      const a = m.triangles[t + k]!,
        b = m.triangles[t + ((k + 1) % 3)]!
      edges.add(Math.min(a, b) * nV + Math.max(a, b))
    }
  }
  return edges.size
}

function signedPlanArea(m: MembraneMesh, t: number): number {
  const [a, b, c] = [0, 1, 2].map((k) => 3 * m.triangles[3 * t + k]!) as [number, number, number]
  const V = m.vertices
  return 0.5 * ((V[b]! - V[a]!) * (V[c + 1]! - V[a + 1]!) - (V[b + 1]! - V[a + 1]!) * (V[c]! - V[a]!))
}

// An L-shaped courtyard with two mast-ring holes, placed off the origin (our own scenario).
const lShape: Pt[] = [
  [0, 0],
  [12, 0],
  [12, 5],
  [5, 5],
  [5, 12],
  [0, 12],
].map(([x, y], i) => ({ x: 40 + x!, y: -7 + y!, z: i % 2 }))
const holes = [circleLoop(10, 1, 42.5, -4.5, 3, true), circleLoop(7, 0.8, 42.5, 2, 2.5)]
const cases: [string, Frame][] = [
  [
    'square',
    frame(
      squareLoop(10, 3, 4, (i) => (i % 2 ? 2 : 0)),
      [],
      0.4,
    ),
  ],
  ['L-shape with two holes', frame(lShape, holes, 0.3)],
  ['disc', frame(circleLoop(40, 5), [], 0.25)],
]

describe.each(cases)('meshFrame on a %s', (_name, f) => {
  const m = meshFrame(f)
  const nV = m.vertices.length / 3,
    nF = m.triangles.length / 3
  const nHoles = f.loops.length - 1

  it('has Euler characteristic V − E + F = 1 − holes (a disc with holes; Euler–Poincaré)', () => {
    expect(nV - edgeCount(m) + nF).toBe(1 - nHoles)
  })

  it('covers exactly the plan domain, all triangles counter-clockwise (shoelace areas)', () => {
    let sum = 0
    for (let t = 0; t < nF; t++) {
      const a = signedPlanArea(m, t)
      expect(a).toBeGreaterThan(0)
      sum += a
    }
    const domain =
      Math.abs(loopSignedArea(flat(f.loops[0]!.points))) -
      f.loops.slice(1).reduce((s, l) => s + Math.abs(loopSignedArea(flat(l.points))), 0)
    expect(sum).toBeCloseTo(domain, 9)
  })

  it('puts no triangle in a hole or outside the outer loop (centroid test)', () => {
    const outer = flat(f.loops[0]!.points),
      hs = f.loops.slice(1).map((l) => flat(l.points))
    for (let t = 0; t < nF; t++) {
      let cx = 0,
        cy = 0
      for (let k = 0; k < 3; k++) {
        cx += m.vertices[3 * m.triangles[3 * t + k]!]! / 3
        cy += m.vertices[3 * m.triangles[3 * t + k]! + 1]! / 3
      }
      expect(pointInLoop(cx, cy, outer)).toBe(true)
      for (const h of hs) expect(pointInLoop(cx, cy, h)).toBe(false)
    }
  })

  it('keeps the smallest angle ≥ 25° (common practice for well-shaped linear elements)', () => {
    expect(m.minAngle).toBeGreaterThanOrEqual(25)
  })

  it('keeps every frame point as a vertex, boundary loops in frame order, z linear along edges', () => {
    f.loops.forEach((loop, l) => {
      const B = m.boundaryLoops[l]!
      expect(m.vertexPoints[B[0]!]).toBe(0)
      const corners = Array.from(B).filter((v) => m.vertexPoints[v]! >= 0)
      expect(corners.map((v) => m.vertexPoints[v])).toEqual(loop.points.map((_, i) => i))
      corners.forEach((v, i) =>
        expect([m.vertices[3 * v], m.vertices[3 * v + 1], m.vertices[3 * v + 2]]).toEqual([
          loop.points[i]!.x,
          loop.points[i]!.y,
          loop.points[i]!.z,
        ]),
      )
      for (const v of B) {
        expect(m.vertexLoops[v]).toBe(l)
        const e = m.vertexEdges[v]!
        const p = loop.points[e]!,
          q = loop.points[(e + 1) % loop.points.length]!
        const len = Math.hypot(q.x - p.x, q.y - p.y)
        const t = Math.hypot(m.vertices[3 * v]! - p.x, m.vertices[3 * v + 1]! - p.y) / len
        // linear interpolation of heights between frame points (elementary)
        expect(m.vertices[3 * v + 2]!).toBeCloseTo(p.z + t * (q.z - p.z), 10)
      }
    })
    // consecutive boundary vertices are joined by a mesh edge (the boundary is constrained)
    const nVv = nV
    const edges = new Set<number>()
    for (let t = 0; t < m.triangles.length; t += 3)
      for (let k = 0; k < 3; k++) {
        const a = m.triangles[t + k]!,
          b = m.triangles[t + ((k + 1) % 3)]!
        edges.add(Math.min(a, b) * nVv + Math.max(a, b))
      }
    for (const B of m.boundaryLoops)
      for (let k = 0; k < B.length; k++) {
        const a = B[k]!,
          b = B[(k + 1) % B.length]!
        expect(edges.has(Math.min(a, b) * nVv + Math.max(a, b))).toBe(true)
      }
    for (let v = 0; v < nV; v++) if (m.vertexLoops[v] === -1) expect(m.vertexEdges[v]).toBe(-1)
  })
})

describe('mesh density', () => {
  it('vertex count scales like area / h² (halving h gives about 4× the vertices)', () => {
    const f = frame(squareLoop(20, -3, 11), [], 0.4)
    const coarse = meshFrame(f).vertices.length / 3
    const fine =
      meshFrame(parseFrameJson({ ...JSON.parse(frameToJson(f)), mesh: { edgeLength: 0.2 } })).vertices.length / 3
    // hexagonal lattice: √3/2·h² of plan area per vertex, so area / (0.866 h²) vertices (elementary geometry)
    expect(coarse / (400 / (0.866 * 0.16))).toBeGreaterThan(0.9)
    expect(coarse / (400 / (0.866 * 0.16))).toBeLessThan(1.1)
    expect(fine / coarse).toBeGreaterThan(3.6)
    expect(fine / coarse).toBeLessThan(4.4)
  })

  it('gives the same connectivity for the same frame (topologyKey is deterministic)', () => {
    const f = frame(lShape, holes, 0.5)
    expect(meshFrame(f).topologyKey).toBe(meshFrame(f).topologyKey)
  })
})
