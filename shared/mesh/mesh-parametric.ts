/**
 * Structured annulus meshes for spatial frames of two loops that overlap in plan (e.g. two coaxial
 * rings one above the other): the solver lofts/relaxes the surface in 3D.
 */
import type { Frame, MembraneMesh } from '../types'
import { resampleLoops } from './boundary'
import { MeshError } from './mesh-error'
import { meshTopologyKey } from './quantities'

export interface ParametricMesh {
  /** vertices = the straight loft between the two loops (a start for the spatial solver). */
  mesh: MembraneMesh
  /** #V×2 planar annulus coordinates: outer loop on the unit circle, hole on radius rho, by arc length. */
  uv: Float64Array
  rho: number
  /** #V ring index: 0 = outer loop … rings−1 = hole. */
  ring: Int32Array
  rings: number
  /** Vertices per ring. */
  perRing: number
}

/**
 * Mesh the strip between loops[0] and loops[1] of `frame` at target edge length h (3D lengths).
 * Both loops are resampled to the same count n (frame points kept); the hole is matched to the
 * outer loop by the rotation and direction that minimise the loft distances. rho = exp(−2π·gap/P)
 * (the conformal annulus of a cylinder of perimeter P and height gap), clamped to [0.05, 0.9].
 * Vertex index of ring k, slot i is k·n + i; the hole's slots follow its own point order.
 */
export function meshParametric(frame: Readonly<Frame>): ParametricMesh {
  if (frame.loops.length !== 2)
    throw new MeshError('loops', 'a parametric mesh needs exactly two loops (outer and one hole)')
  const h = frame.mesh.edgeLength
  const perims = frame.loops.map((loop) =>
    loop.points.reduce((s, p, i) => {
      const q = loop.points[(i + 1) % loop.points.length]!
      return s + Math.hypot(q.x - p.x, q.y - p.y, q.z - p.z)
    }, 0),
  )
  const counts = frame.loops.map((l) => l.points.length)
  const n = Math.max(12, counts[0]!, counts[1]!, Math.round((perims[0]! + perims[1]!) / (2 * h)))
  const divisions = frame.loops.map((loop, l) => edgeDivisions(frame, l, n, perims[l]!))
  const b = resampleLoops(frame, (l, e) => divisions[l]![e]!)
  const outer = b.loops[0]!,
    hole = b.loops[1]!
  const P = (k: number, c: number): number => b.xyz[3 * k + c]!
  const { shift, dir } = bestMatch(n, (i, j) => {
    const a = outer[i]!,
      c = hole[j]!
    return (P(a, 0) - P(c, 0)) ** 2 + (P(a, 1) - P(c, 1)) ** 2 + (P(a, 2) - P(c, 2)) ** 2
  })
  const match = (i: number): number => (((shift + dir * i) % n) + n) % n
  let gap = 0
  for (let i = 0; i < n; i++) {
    const a = outer[i]!,
      c = hole[match(i)]!
    gap += Math.hypot(P(a, 0) - P(c, 0), P(a, 1) - P(c, 1), P(a, 2) - P(c, 2)) / n
  }
  const rings = Math.max(3, Math.round(gap / h) + 1)
  const rho = Math.min(0.9, Math.max(0.05, Math.exp((-2 * Math.PI * gap) / ((perims[0]! + perims[1]!) / 2))))
  const thetaOuter = arcAngles(n, (i) => outer[i]!, b.xyz)
  const thetaHole = arcAngles(n, (i) => hole[match(i)]!, b.xyz)

  const nV = rings * n
  const vertices = new Float64Array(3 * nV)
  const uv = new Float64Array(2 * nV)
  const ring = new Int32Array(nV)
  const vertexLoops = new Int32Array(nV).fill(-1)
  const vertexEdges = new Int32Array(nV).fill(-1)
  const vertexPoints = new Int32Array(nV).fill(-1)
  const slotVertex = (k: number, i: number): number => k * n + (k === rings - 1 ? match(i) : i)
  for (let k = 0; k < rings; k++) {
    const s = k / (rings - 1)
    // geometric radii: equal steps in ln r match equal steps in angle (a conformal grid)
    const r = rho ** s
    for (let i = 0; i < n; i++) {
      const v = slotVertex(k, i)
      const a = outer[i]!,
        c = hole[match(i)]!
      for (let d = 0; d < 3; d++) vertices[3 * v + d] = (1 - s) * P(a, d) + s * P(c, d)
      const th = (1 - s) * thetaOuter[i]! + s * thetaHole[i]!
      uv[2 * v] = r * Math.cos(th)
      uv[2 * v + 1] = r * Math.sin(th)
      ring[v] = k
      const sample = k === 0 ? a : k === rings - 1 ? c : -1
      if (sample >= 0) {
        vertexLoops[v] = b.loopOf[sample]!
        vertexEdges[v] = b.edgeOf[sample]!
        vertexPoints[v] = b.pointOf[sample]!
      }
    }
  }
  const triangles = new Uint32Array(6 * n * (rings - 1))
  let t = 0
  for (let k = 0; k + 1 < rings; k++) {
    for (let i = 0; i < n; i++) {
      const a = slotVertex(k, i),
        bb = slotVertex(k, (i + 1) % n)
      const c = slotVertex(k + 1, (i + 1) % n),
        d = slotVertex(k + 1, i)
      // Alternate the diagonal so the strip has no preferred shear direction.
      const quad = (k + i) % 2 === 0 ? [a, bb, c, a, c, d] : [a, bb, d, bb, c, d]
      triangles.set(quad, t)
      t += 6
    }
  }
  orientCounterClockwise(uv, triangles)
  const mesh: MembraneMesh = {
    vertices,
    triangles,
    vertexLoops,
    vertexEdges,
    vertexPoints,
    boundaryLoops: [Uint32Array.from(outer, (_, j) => j), Uint32Array.from(hole, (_, j) => (rings - 1) * n + j)],
    minAngle: uvMinAngle(uv, triangles),
    topologyKey: meshTopologyKey(nV, triangles),
  }
  return { mesh, uv, rho, ring, rings, perRing: n }
}

/** Divisions per edge of loop l so the loop has exactly n samples, shared out by 3D length. */
function edgeDivisions(frame: Readonly<Frame>, l: number, n: number, perimeter: number): number[] {
  const pts = frame.loops[l]!.points
  const k = pts.length
  const lengths = pts.map((p, i) => {
    const q = pts[(i + 1) % k]!
    return Math.hypot(q.x - p.x, q.y - p.y, q.z - p.z)
  })
  const ideal = lengths.map((len) => ((n - k) * len) / perimeter)
  const div = ideal.map((x) => 1 + Math.floor(x))
  let left = n - div.reduce((s, x) => s + x, 0)
  const order = ideal.map((x, i) => [x - Math.floor(x), i] as const).sort((a, b) => b[0] - a[0])
  for (const [, i] of order) {
    if (left <= 0) break
    div[i]!++
    left--
  }
  return div
}

/** Rotation and direction of the hole's slots minimising Σ cost(i, match(i)). O(n²). */
function bestMatch(n: number, cost: (i: number, j: number) => number): { shift: number; dir: 1 | -1 } {
  let best = { shift: 0, dir: 1 as 1 | -1 },
    bestCost = Infinity
  for (const dir of [1, -1] as const) {
    for (let shift = 0; shift < n; shift++) {
      let c = 0
      for (let i = 0; i < n && c < bestCost; i++) c += cost(i, (((shift + dir * i) % n) + n) % n)
      if (c < bestCost) {
        bestCost = c
        best = { shift, dir }
      }
    }
  }
  return best
}

/** Angles 2π·(arc length to slot i)/(loop length) of the samples slot(0…n−1), radians. */
function arcAngles(n: number, slot: (i: number) => number, xyz: readonly number[]): Float64Array {
  const acc = new Float64Array(n + 1)
  for (let i = 0; i < n; i++) {
    const a = 3 * slot(i),
      c = 3 * slot((i + 1) % n)
    acc[i + 1] = acc[i]! + Math.hypot(xyz[c]! - xyz[a]!, xyz[c + 1]! - xyz[a + 1]!, xyz[c + 2]! - xyz[a + 2]!)
  }
  const out = new Float64Array(n)
  for (let i = 0; i < n; i++) out[i] = (2 * Math.PI * acc[i]!) / acc[n]!
  return out
}

function orientCounterClockwise(uv: Float64Array, T: Uint32Array): void {
  for (let t = 0; t < T.length; t += 3) {
    const a = 2 * T[t]!,
      b = 2 * T[t + 1]!,
      c = 2 * T[t + 2]!
    const s = (uv[b]! - uv[a]!) * (uv[c + 1]! - uv[a + 1]!) - (uv[b + 1]! - uv[a + 1]!) * (uv[c]! - uv[a]!)
    if (s < 0) {
      const x = T[t + 1]!
      T[t + 1] = T[t + 2]!
      T[t + 2] = x
    }
  }
}

function uvMinAngle(uv: Float64Array, T: Uint32Array): number {
  let m = Math.PI
  for (let t = 0; t < T.length; t += 3) {
    for (let k = 0; k < 3; k++) {
      const p = 2 * T[t + k]!,
        q = 2 * T[t + ((k + 1) % 3)]!,
        r = 2 * T[t + ((k + 2) % 3)]!
      const ux = uv[q]! - uv[p]!,
        uy = uv[q + 1]! - uv[p + 1]!,
        vx = uv[r]! - uv[p]!,
        vy = uv[r + 1]! - uv[p + 1]!
      m = Math.min(m, Math.atan2(Math.abs(ux * vy - uy * vx), ux * vx + uy * vy))
    }
  }
  return (m * 180) / Math.PI
}
