import { describe, expect, it } from 'vitest'
import { computeFigures, DEFAULT_FLAT_THRESHOLD } from '../../shared/figures'
import { meshFrame } from '../../shared/mesh'
import { faceAreas, vertexAngleDefects } from '../../shared/mesh/quantities'
import { parseFrameJson } from '../../shared/frame'
import type { MembraneMesh } from '../../shared/types'
import { frameFile, squareLoop } from './frame-fixtures'

// An 8 m × 8 m square placed off the origin, centre (c, c); analytic surfaces are set on its mesh.
const c = 14
const frame = parseFrameJson({ ...frameFile(squareLoop(8, c - 4, c - 4), [], 0.25), prestress: { warp: 2, fill: 2 } })
const mesh = meshFrame(frame)
function withHeights(u: (x: number, y: number) => number): MembraneMesh {
  const V = Float64Array.from(mesh.vertices)
  for (let v = 0; v < V.length / 3; v++) V[3 * v + 2] = u(V[3 * v]!, V[3 * v + 1]!)
  return { ...mesh, vertices: V }
}

describe('figures on analytic surfaces', () => {
  it('flat plane: area = plan area, flatShare = 1, no pockets, no anticlastic area', () => {
    const f = computeFigures(
      withHeights(() => 1.5),
      frame,
    )
    expect(f.area).toBeCloseTo(64, 9)
    expect(f.planArea).toBeCloseTo(64, 9)
    expect(f.perimeter).toBeCloseTo(32, 9)
    expect(f.flatShare).toBe(1)
    expect(f.flatThreshold).toBe(DEFAULT_FLAT_THRESHOLD)
    expect(f.pondingPockets).toEqual([])
    expect(f.anticlasticShare).toBe(0)
    expect(f.heightRange).toEqual([1.5, 1.5])
  })

  it('tilted plane: area = |n|·plan area and slope = atan|∇z| on every face (elementary geometry)', () => {
    const a = 0.3,
      b = -0.1
    const f = computeFigures(
      withHeights((x, y) => a * x + b * y),
      frame,
    )
    expect(f.area).toBeCloseTo(64 * Math.sqrt(1 + a * a + b * b), 9)
    const slope = (Math.atan(Math.hypot(a, b)) * 180) / Math.PI
    expect(f.slopeRange[0]).toBeCloseTo(slope, 9)
    expect(f.slopeRange[1]).toBeCloseTo(slope, 9)
    expect(f.flatShare).toBe(0)
    expect(f.slopeHistogram.shares.reduce((s, x) => s + x, 0)).toBeCloseTo(1, 12)
    const bin = Math.floor(slope / 5)
    expect(f.slopeHistogram.shares[bin]).toBeCloseTo(1, 12)
    // a 1.5° plane is flat under the 5° default and not flat under a 1° threshold
    const gentle = withHeights((x) => Math.tan((1.5 * Math.PI) / 180) * x)
    expect(computeFigures(gentle, frame).flatShare).toBe(1)
    expect(computeFigures(gentle, frame, { flatThreshold: 1 }).flatShare).toBe(0)
  })

  it('spherical cap: angle defects carry K = 1/R² per unit area, no anticlastic area', () => {
    const R = 10
    const cap = withHeights((x, y) => Math.sqrt(R * R - (x - c) ** 2 - (y - c) ** 2))
    const f = computeFigures(cap, frame)
    // Gauss–Bonnet: the angle defect at a vertex is the Gaussian curvature integrated over its
    // share of the surface, and K = 1/R² everywhere on a sphere of radius R (differential geometry).
    const V = cap.vertices,
      T = cap.triangles
    const boundary = Array.from(cap.vertexLoops, (l) => (l >= 0 ? 1 : 0))
    const defects = vertexAngleDefects(new Float64Array(V.length / 3), V, T, boundary)
    const share = new Float64Array(V.length / 3)
    const areas = faceAreas(new Float64Array(T.length / 3), V, T)
    for (let t = 0; t < T.length / 3; t++) for (let k = 0; k < 3; k++) share[T[3 * t + k]!]! += areas[t]! / 3
    let defectSum = 0,
      interiorArea = 0
    for (let v = 0; v < share.length; v++) {
      if (boundary[v]) continue
      expect(defects[v]!).toBeGreaterThan(0)
      defectSum += defects[v]!
      interiorArea += share[v]!
    }
    expect(defectSum / interiorArea).toBeCloseTo(1 / (R * R), 4)
    expect(f.anticlasticShare).toBe(0)
    // the cap's top is its highest point, not a pocket
    expect(f.pondingPockets).toEqual([])
  })

  it('saddle (hypar): anticlastic everywhere, no ponding pocket', () => {
    const f = computeFigures(
      withHeights((x, y) => 0.05 * ((x - c) ** 2 - (y - c) ** 2)),
      frame,
    )
    // K = −4k²/(1+|∇z|²)² < 0 for z = k(x² − y²) (differential geometry of graphs)
    expect(f.anticlasticShare).toBeGreaterThan(0.99)
    // a saddle has no interior minimum: water runs off to the boundary
    expect(f.pondingPockets).toEqual([])
  })

  it('bowl: one ponding pocket at the low point holding the disc below the spill height', () => {
    const f = computeFigures(
      withHeights((x, y) => 0.05 * ((x - c) ** 2 + (y - c) ** 2)),
      frame,
    )
    expect(f.pondingPockets).toHaveLength(1)
    const p = f.pondingPockets[0]!
    expect([p.x, p.y]).toEqual([c, c].map((v) => expect.closeTo(v, 0)))
    // spill at the edge midpoints (r = 4 m): the pond is the disc r < 4, area π·4² (elementary);
    // lumped vertex areas on h = 0.25 m blur the rim by about one element: 2π·4·0.25 ≈ 6 m²
    expect(Math.abs(p.area - Math.PI * 16)).toBeLessThan(2 * Math.PI * 4 * 0.25)
  })
})

describe('boundary forces', () => {
  it('a flat square under prestress σ pulls each corner by σ·L/2 from each adjacent edge (statics)', () => {
    const f = computeFigures(
      withHeights(() => 0),
      frame,
    )
    const sigma = 2,
      L = 8
    const byPoint = new Map(f.reactions.map(([, p, fx, fy, fz]) => [p, [fx, fy, fz]]))
    // corner 0 is the lower-left: pulled towards +x by the left edge and +y by the bottom edge
    expect(byPoint.get(0)![0]).toBeCloseTo((sigma * L) / 2, 9)
    expect(byPoint.get(0)![1]).toBeCloseTo((sigma * L) / 2, 9)
    expect(byPoint.get(2)![0]).toBeCloseTo((-sigma * L) / 2, 9)
    // closed frame in equilibrium: the forces sum to zero
    const sum = f.reactions.reduce((s, r) => [s[0]! + r[2], s[1]! + r[3], s[2]! + r[4]], [0, 0, 0])
    for (const x of sum) expect(Math.abs(x)).toBeLessThan(1e-9)
  })

  it('cable figures: length and sag of a circular arc (circle geometry)', () => {
    const cable = parseFrameJson({
      ...frameFile(squareLoop(10), [], 0.25),
      loops: [
        {
          role: 'outer',
          points: squareLoop(10),
          edges: [{ kind: 'cable', tension: 50 }, { kind: 'rigid' }, { kind: 'rigid' }, { kind: 'rigid' }],
        },
      ],
    })
    const m = meshFrame(cable)
    // bend the bottom edge (y = 0, chord 10 m) into an arc of radius r = T/σ = 50/2 = 25 m inward
    const r = 25,
      sag = r - Math.sqrt(r * r - 25)
    const V = Float64Array.from(m.vertices)
    for (let v = 0; v < V.length / 3; v++) {
      if (m.vertexLoops[v] !== 0 || m.vertexEdges[v] !== 0 || m.vertexPoints[v] === 0) continue
      const x = V[3 * v]! - 5
      V[3 * v + 1] = Math.sqrt(r * r - x * x) - (r - sag)
    }
    const f = computeFigures({ ...m, vertices: V }, cable)
    expect(f.cables).toHaveLength(1)
    expect(f.cables[0]!.force).toBe(50)
    expect(f.cables[0]!.sag).toBeCloseTo(0.505102572, 3) // CHECKS.md: T = 50 kN, σ = 2 kN/m, L = 10 m
    const arc = 2 * r * Math.asin(5 / r)
    // a chord polygon of ≈ 40 segments is shorter than its arc by about L·θ²/24 per segment: < 1 mm here
    expect(f.cables[0]!.length).toBeCloseTo(arc, 3)
  })
})
