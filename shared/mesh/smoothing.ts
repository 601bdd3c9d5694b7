/** Vertex adjacency and Laplacian smoothing of interior plan vertices. */
import { orient } from './plan-geometry'

/** CSR vertex neighbour lists (with repeats: an interior edge appears once per adjacent face). */
export interface VertexNeighbours {
  start: Int32Array
  list: Int32Array
}

/** Neighbours of each vertex over the triangles `keep` (indices into T, #T×3), or all when null. */
export function buildVertexNeighbours(nV: number, T: Readonly<Uint32Array>, keep: readonly number[] | null): VertexNeighbours {
  const tris = keep ?? Array.from({ length: T.length / 3 }, (_, i) => i)
  const start = new Int32Array(nV + 1)
  for (const t of tris) for (let k = 0; k < 3; k++) start[T[3 * t + k]! + 1]! += 2
  for (let v = 0; v < nV; v++) start[v + 1]! += start[v]!
  const fill = start.slice(0, nV)
  const list = new Int32Array(start[nV]!)
  for (const t of tris) {
    for (let k = 0; k < 3; k++) {
      const v = T[3 * t + k]!
      list[fill[v]!++] = T[3 * t + ((k + 1) % 3)]!
      list[fill[v]!++] = T[3 * t + ((k + 2) % 3)]!
    }
  }
  return { start, list }
}

/** Vertex → incident triangle lists (CSR) over the triangles `keep`. */
function buildVertexFaces(nV: number, T: Readonly<Uint32Array>, keep: readonly number[]): VertexNeighbours {
  const start = new Int32Array(nV + 1)
  for (const t of keep) for (let k = 0; k < 3; k++) start[T[3 * t + k]! + 1]!++
  for (let v = 0; v < nV; v++) start[v + 1]! += start[v]!
  const fill = start.slice(0, nV)
  const list = new Int32Array(start[nV]!)
  for (const t of keep) for (let k = 0; k < 3; k++) list[fill[T[3 * t + k]!]!++] = t
  return { start, list }
}

/** Smallest corner angle (as its cosine's complement: larger is better) of plan triangle t, radians. */
function planTriangleMinAngle(coords: Readonly<Float64Array>, T: Readonly<Uint32Array>, t: number): number {
  let m = Math.PI
  for (let k = 0; k < 3; k++) {
    const p = 2 * T[3 * t + k]!, q = 2 * T[3 * t + ((k + 1) % 3)]!, r = 2 * T[3 * t + ((k + 2) % 3)]!
    const ux = coords[q]! - coords[p]!, uy = coords[q + 1]! - coords[p + 1]!
    const vx = coords[r]! - coords[p]!, vy = coords[r + 1]! - coords[p + 1]!
    const cross = ux * vy - uy * vx
    // A turned-over triangle scores below every valid one.
    const ang = cross <= 0 ? -1 : Math.atan2(cross, ux * vx + uy * vy)
    if (ang < m) m = ang
  }
  return m
}

/**
 * "Smart" Laplacian sweeps of interior plan vertices (coords: #V×2, m): a vertex moves to the mean
 * of its neighbours only when that raises the smallest angle of its incident triangles, so the
 * sweeps never turn a triangle over and never lower the mesh's minimum angle. Vertices whose star
 * is already well shaped (the hexagonal lattice, angles ≥ 50°) are skipped for speed.
 * T: Delaunator triangles whose orientation may be either sign (handled per triangle).
 */
export function smoothInterior(
  coords: Float64Array,
  nb: Readonly<VertexNeighbours>,
  isInterior: Readonly<Uint8Array>,
  T: Readonly<Uint32Array>,
  keep: readonly number[],
  sweeps: number,
): void {
  const nV = coords.length / 2
  const faces = buildVertexFaces(nV, T, keep)
  // Make every kept triangle counter-clockwise once so the angle score can detect turning over.
  const Tc = Uint32Array.from(T)
  for (const t of keep) {
    const a = 2 * Tc[3 * t]!, b = 2 * Tc[3 * t + 1]!, c = 2 * Tc[3 * t + 2]!
    if (orient(coords[a]!, coords[a + 1]!, coords[b]!, coords[b + 1]!, coords[c]!, coords[c + 1]!) < 0) {
      const s = Tc[3 * t + 1]!
      Tc[3 * t + 1] = Tc[3 * t + 2]!
      Tc[3 * t + 2] = s
    }
  }
  const starMin = (v: number): number => {
    let m = Math.PI
    for (let k = faces.start[v]!; k < faces.start[v + 1]!; k++) m = Math.min(m, planTriangleMinAngle(coords, Tc, faces.list[k]!))
    return m
  }
  const wellShaped = (50 * Math.PI) / 180
  for (let s = 0; s < sweeps; s++) {
    for (let v = 0; v < nV; v++) {
      if (!isInterior[v]) continue
      const a = nb.start[v]!, e = nb.start[v + 1]!
      if (e === a) continue
      const before = starMin(v)
      if (before >= wellShaped) continue
      const ox = coords[2 * v]!, oy = coords[2 * v + 1]!
      let x = 0, y = 0
      for (let k = a; k < e; k++) {
        x += coords[2 * nb.list[k]!]!
        y += coords[2 * nb.list[k]! + 1]!
      }
      coords[2 * v] = x / (e - a)
      coords[2 * v + 1] = y / (e - a)
      if (starMin(v) <= before) {
        coords[2 * v] = ox
        coords[2 * v + 1] = oy
      }
    }
  }
}
