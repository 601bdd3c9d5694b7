/**
 * A geodesic seam as a level set: the shortest edge path (Dijkstra) between the two snapped end
 * vertices marks a corridor two triangle rings wide; the corridor is laid flat (LSCM + ARAP) and
 * the seam is the straight segment between the ends there, mapped back. A straight line in a
 * developed band is a geodesic of the band (exact when the band is developable, otherwise within
 * the band's flattening strain); the cut then follows it across triangles, not along zig-zag edges.
 */
import { MinHeap } from '../figures/min-heap'
import { arapRefine } from './local-global'
import { lscmFlatten } from './lscm'
import { directedBoundary } from './mesh-edges'
import { PatternError } from './pattern-error'
import { triangleFrames } from './triangle-frames'
import type { GeodesicSeam, TriangleMesh } from './types'

function nearestVertex(vertices: Readonly<Float64Array>, p: readonly number[]): number {
  let best = 0,
    bestD = Infinity
  for (let v = 0; v < vertices.length / 3; v++) {
    const d =
      (vertices[3 * v]! - p[0]!) ** 2 + (vertices[3 * v + 1]! - p[1]!) ** 2 + (vertices[3 * v + 2]! - p[2]!) ** 2
    if (d < bestD) {
      bestD = d
      best = v
    }
  }
  return best
}

/** Vertices of the shortest edge path from s to e, or null when they are not connected. */
function edgePath(mesh: Readonly<TriangleMesh>, s: number, e: number): number[] | null {
  const { vertices, triangles } = mesh
  const n = vertices.length / 3
  const neighbours: number[][] = Array.from({ length: n }, () => [])
  for (let t = 0; t < triangles.length; t += 3) {
    for (let k = 0; k < 3; k++)
      neighbours[triangles[t + k]!]!.push(triangles[t + ((k + 1) % 3)]!, triangles[t + ((k + 2) % 3)]!)
  }
  const dist = new Float64Array(n).fill(Infinity)
  const from = new Int32Array(n).fill(-1)
  const heap = new MinHeap()
  dist[s] = 0
  heap.push(s, 0)
  while (heap.size > 0) {
    const v = heap.pop()
    if (v === e) break
    for (const w of neighbours[v]!) {
      const d =
        dist[v]! +
        Math.hypot(
          vertices[3 * w]! - vertices[3 * v]!,
          vertices[3 * w + 1]! - vertices[3 * v + 1]!,
          vertices[3 * w + 2]! - vertices[3 * v + 2]!,
        )
      if (d < dist[w]!) {
        dist[w] = d
        from[w] = v
        heap.push(w, d)
      }
    }
  }
  if (!Number.isFinite(dist[e]!)) return null
  const path = [e]
  while (path[path.length - 1] !== s) path.push(from[path[path.length - 1]!]!)
  return path.reverse()
}

/** Triangles touching the marked vertices, grown by `rings` more rings. */
function corridor(
  triangles: Readonly<Uint32Array>,
  vertexCount: number,
  seeds: readonly number[],
  rings: number,
): number[] {
  const marked = new Uint8Array(vertexCount)
  for (const v of seeds) marked[v] = 1
  let chosen: number[] = []
  for (let r = 0; r <= rings; r++) {
    chosen = []
    for (let t = 0; t < triangles.length / 3; t++) {
      if (marked[triangles[3 * t]!] || marked[triangles[3 * t + 1]!] || marked[triangles[3 * t + 2]!]) chosen.push(t)
    }
    for (const t of chosen) for (let k = 0; k < 3; k++) marked[triangles[3 * t + k]!] = 1
  }
  return chosen
}

/**
 * The level-set field of a geodesic seam on `mesh`: phi (#V, signed flat distance to the segment's
 * line in the corridor, 1 elsewhere) and the triangles allowed to carry it (#T flags).
 * Throws PatternError naming `field` when the ends coincide or are not joined by the surface.
 */
export function geodesicField(
  mesh: Readonly<TriangleMesh>,
  seam: Readonly<GeodesicSeam>,
  field: string,
): { phi: Float64Array; active: Uint8Array } {
  const { vertices, triangles } = mesh
  const s = nearestVertex(vertices, seam.from),
    e = nearestVertex(vertices, seam.to)
  if (s === e) throw new PatternError('geodesic-not-traced', 'both ends snap to the same surface point', field)
  const path = edgePath(mesh, s, e)
  if (!path) throw new PatternError('geodesic-not-traced', 'the two ends are not joined by the surface', field)
  // an edge path may wander from the straight line (many equally short staircases on a lattice):
  // widen the corridor until the straight segment fits in it
  let failure: PatternError | null = null
  for (const rings of [2, 5, 10, 20]) {
    const band = corridor(triangles, vertices.length / 3, path, rings)
    const traced = traceInBand(mesh, band, s, e, field)
    if (!(traced instanceof PatternError)) return traced
    failure = traced
  }
  throw failure!
}

function traceInBand(
  mesh: Readonly<TriangleMesh>,
  band: number[],
  s: number,
  e: number,
  field: string,
): { phi: Float64Array; active: Uint8Array } | PatternError {
  const { vertices, triangles } = mesh
  const local = new Map<number, number>()
  const bandVertices: number[] = []
  const bandTriangles = new Uint32Array(3 * band.length)
  band.forEach((t, i) => {
    for (let k = 0; k < 3; k++) {
      const g = triangles[3 * t + k]!
      if (!local.has(g)) {
        local.set(g, bandVertices.length)
        bandVertices.push(g)
      }
      bandTriangles[3 * i + k] = local.get(g)!
    }
  })
  const bandPositions = new Float64Array(3 * bandVertices.length)
  bandVertices.forEach((g, l) => bandPositions.set(vertices.subarray(3 * g, 3 * g + 3), 3 * l))
  const frames = triangleFrames(bandPositions, bandTriangles)
  const ls = local.get(s)!,
    le = local.get(e)!
  const uv = lscmFlatten(bandPositions, bandTriangles, frames, directedBoundary(bandTriangles), [ls, le])
  arapRefine(uv, bandTriangles, frames, ls, { arapIterations: 10, strainIterations: 0 })
  return levelSet(mesh, uv, band, bandTriangles, bandVertices, ls, le, field)
}

/** Splits allowed only where the zero line's piece in a triangle lies between the two ends. */
function levelSet(
  mesh: Readonly<TriangleMesh>,
  uv: Readonly<Float64Array>,
  band: readonly number[],
  bandTriangles: Readonly<Uint32Array>,
  bandVertices: readonly number[],
  ls: number,
  le: number,
  field: string,
): { phi: Float64Array; active: Uint8Array } | PatternError {
  const su = uv[2 * ls]!,
    sv = uv[2 * ls + 1]!
  const du = uv[2 * le]! - su,
    dv = uv[2 * le + 1]! - sv
  const span = Math.hypot(du, dv)
  const phiLocal = new Float64Array(bandVertices.length)
  const tau = new Float64Array(bandVertices.length)
  for (let l = 0; l < bandVertices.length; l++) {
    const pu = uv[2 * l]! - su,
      pv = uv[2 * l + 1]! - sv
    phiLocal[l] = l === ls || l === le ? 0 : (du * pv - dv * pu) / span
    tau[l] = (du * pu + dv * pv) / (span * span)
  }
  const phi = new Float64Array(mesh.vertices.length / 3).fill(1)
  bandVertices.forEach((g, l) => (phi[g] = phiLocal[l]!))
  const active = new Uint8Array(mesh.triangles.length / 3)
  let traced = 0
  band.forEach((t, i) => {
    // where the zero line enters and leaves this triangle, as (τ, flat position along the line)
    const hits: number[] = []
    for (let k = 0; k < 3; k++) {
      const a = bandTriangles[3 * i + k]!,
        b = bandTriangles[3 * i + ((k + 1) % 3)]!
      if (phiLocal[a] === 0) hits.push(tau[a]!)
      else if (phiLocal[a]! * phiLocal[b]! < 0) {
        const f = phiLocal[a]! / (phiLocal[a]! - phiLocal[b]!)
        hits.push(tau[a]! + f * (tau[b]! - tau[a]!))
      }
    }
    if (hits.length < 2) return
    const lo = Math.max(Math.min(...hits), 0),
      hi = Math.min(Math.max(...hits), 1)
    if (hi - lo > 1e-9) {
      active[t] = 1
      traced += hi - lo
    }
  })
  // the pieces must cover the whole segment (overlaps along an edge are harmless), or the line left the corridor
  if (traced < 1 - 1e-6)
    return new PatternError(
      'geodesic-not-traced',
      'the shortest line between the ends leaves the surface or bends too sharply to trace',
      field,
    )
  return { phi, active }
}
