import { describe, expect, it } from 'vitest'
import { faceAreas, meshFrame, meshParametric, remapMesh } from '../../shared/mesh'
import { parseFrameJson } from '../../shared/frame'
import { circleLoop, frameFile, squareLoop } from './frame-fixtures'

describe('meshParametric for two rings one above the other', () => {
  // rings of radius 1 a gap 1 apart (the catenoid case of CHECKS.md), the upper ring turned and
  // listed the other way round to exercise the matching of the two loops
  const f = parseFrameJson(
    frameFile(
      circleLoop(32, 1, 2, -1, 0),
      [circleLoop(20, 1, 2, -1, 1, true).map((p, i, a) => a[(i + 3) % a.length]!)],
      0.1,
    ),
  )
  const p = meshParametric(f)
  const m = p.mesh
  const nV = m.vertices.length / 3

  it('is an annulus: V − E + F = 0 (Euler–Poincaré) and every uv triangle counter-clockwise', () => {
    const edges = new Set<number>()
    for (let t = 0; t < m.triangles.length; t += 3)
      for (let k = 0; k < 3; k++) {
        const a = m.triangles[t + k]!,
          b = m.triangles[t + ((k + 1) % 3)]!
        edges.add(Math.min(a, b) * nV + Math.max(a, b))
      }
    expect(nV - edges.size + m.triangles.length / 3).toBe(0)
    for (let t = 0; t < m.triangles.length; t += 3) {
      const [a, b, c] = [0, 1, 2].map((k) => 2 * m.triangles[t + k]!) as [number, number, number]
      const s =
        (p.uv[b]! - p.uv[a]!) * (p.uv[c + 1]! - p.uv[a + 1]!) - (p.uv[b + 1]! - p.uv[a + 1]!) * (p.uv[c]! - p.uv[a]!)
      expect(s).toBeGreaterThan(0)
    }
    expect(nV).toBe(p.rings * p.perRing)
  })

  it('maps the outer loop to the unit circle and the hole to radius rho, keeping frame points', () => {
    for (const v of m.boundaryLoops[0]!) expect(Math.hypot(p.uv[2 * v]!, p.uv[2 * v + 1]!)).toBeCloseTo(1, 12)
    for (const v of m.boundaryLoops[1]!) expect(Math.hypot(p.uv[2 * v]!, p.uv[2 * v + 1]!)).toBeCloseTo(p.rho, 12)
    f.loops.forEach((loop, l) => {
      const corners = Array.from(m.boundaryLoops[l]!).filter((v) => m.vertexPoints[v]! >= 0)
      expect(corners.map((v) => m.vertexPoints[v])).toEqual(loop.points.map((_, i) => i))
      corners.forEach((v, i) => expect(m.vertices[3 * v + 2]).toBe(loop.points[i]!.z))
    })
  })

  it('is refused by the plan mesher, which names the loop', () => {
    expect(() => meshFrame(f)).toThrow(/loops\[1\].*meshParametric/)
  })

  it('lofts straight between the rings: area near the cylinder 2π·R·h (elementary geometry)', () => {
    const A = faceAreas(new Float64Array(m.triangles.length / 3), m.vertices, m.triangles).reduce((s, a) => s + a, 0)
    // polygon rings of 20–32 sides: inscribed perimeter error ≤ 1 − sin(π/20)/(π/20) ≈ 0.4 %
    expect(A / (2 * Math.PI)).toBeGreaterThan(0.99)
    expect(A / (2 * Math.PI)).toBeLessThanOrEqual(1)
  })
})

describe('remapMesh', () => {
  const file = (dx: number) =>
    frameFile(
      squareLoop(8, 0, 0, (i) => (i % 2 ? 2 : 0)).map((q, i) => (i === 2 ? { ...q, x: q.x + dx, y: q.y + dx } : q)),
      [],
      0.3,
    )
  const base = meshFrame(parseFrameJson(file(0)))

  it('keeps the connectivity and moves boundary vertices onto the new edges', () => {
    const f = parseFrameJson(file(0.16))
    const m = remapMesh(base, f)!
    expect(m).not.toBeNull()
    expect(m.topologyKey).toBe(base.topologyKey)
    expect(m.triangles).toBe(base.triangles)
    const corner = Array.from(m.boundaryLoops[0]!).find((v) => m.vertexPoints[v] === 2)!
    expect([m.vertices[3 * corner], m.vertices[3 * corner + 1]]).toEqual([8.16, 8.16])
    // every boundary vertex lies on its new frame edge (distance to the line ≈ 0)
    for (const v of m.boundaryLoops[0]!) {
      const e = m.vertexEdges[v]!
      const a = f.loops[0]!.points[e]!,
        b = f.loops[0]!.points[(e + 1) % 4]!
      const cross = (b.x - a.x) * (m.vertices[3 * v + 1]! - a.y) - (b.y - a.y) * (m.vertices[3 * v]! - a.x)
      expect(Math.abs(cross) / Math.hypot(b.x - a.x, b.y - a.y)).toBeLessThan(1e-9)
    }
    expect(m.minAngle).toBeGreaterThan(20)
  })

  it('refuses a changed structure or a move that would turn triangles over', () => {
    expect(
      remapMesh(
        base,
        parseFrameJson({ ...file(0), loops: [{ role: 'outer', points: [...squareLoop(8), { x: -1, y: 4, z: 0 }] }] }),
      ),
    ).toBeNull()
    expect(remapMesh(base, parseFrameJson(file(-5)))).toBeNull()
  })
})
