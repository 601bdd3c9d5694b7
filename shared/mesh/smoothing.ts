/** Vertex adjacency and Laplacian smoothing of interior plan vertices. */

/** CSR vertex neighbour lists (with repeats: an interior edge appears once per adjacent face). */
export interface VertexNeighbours {
  start: Int32Array
  list: Int32Array
}

/** Neighbours of each vertex over the triangles T (#T×3). */
export function buildVertexNeighbours(nV: number, T: Readonly<Uint32Array>): VertexNeighbours {
  const start = new Int32Array(nV + 1)
  for (let i = 0; i < T.length; i++) start[T[i]! + 1]! += 2
  for (let v = 0; v < nV; v++) start[v + 1]! += start[v]!
  const fill = start.slice(0, nV)
  const list = new Int32Array(start[nV]!)
  for (let t = 0; t < T.length; t += 3) {
    for (let k = 0; k < 3; k++) {
      const v = T[t + k]!
      list[fill[v]!++] = T[t + ((k + 1) % 3)]!
      list[fill[v]!++] = T[t + ((k + 2) % 3)]!
    }
  }
  return { start, list }
}

/** Vertex → incident triangle lists (CSR), only for vertices marked in `which`. */
function buildVertexFaces(nV: number, T: Readonly<Uint32Array>, which: Readonly<Uint8Array>): VertexNeighbours {
  const start = new Int32Array(nV + 1)
  for (let i = 0; i < T.length; i++) if (which[T[i]!]) start[T[i]! + 1]!++
  for (let v = 0; v < nV; v++) start[v + 1]! += start[v]!
  const fill = start.slice(0, nV)
  const list = new Int32Array(start[nV]!)
  for (let i = 0; i < T.length; i++) if (which[T[i]!]) list[fill[T[i]!]!++] = (i / 3) | 0
  return { start, list }
}

/** Smallest corner angle (as its cosine's complement: larger is better) of plan triangle t, radians. */
function planTriangleMinAngle(coords: Readonly<Float64Array>, T: Readonly<Uint32Array>, t: number): number {
  let m = Math.PI
  for (let k = 0; k < 3; k++) {
    const p = 2 * T[3 * t + k]!,
      q = 2 * T[3 * t + ((k + 1) % 3)]!,
      r = 2 * T[3 * t + ((k + 2) % 3)]!
    const ux = coords[q]! - coords[p]!,
      uy = coords[q + 1]! - coords[p + 1]!
    const vx = coords[r]! - coords[p]!,
      vy = coords[r + 1]! - coords[p + 1]!
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
 * is already well shaped (angles ≥ 50°) are skipped. T: #T×3, counter-clockwise in plan.
 */
export function smoothInterior(
  coords: Float64Array,
  nb: Readonly<VertexNeighbours>,
  isInterior: Readonly<Uint8Array>,
  T: Readonly<Uint32Array>,
  sweeps: number,
): void {
  const nV = coords.length / 2
  const faces = buildVertexFaces(nV, T, isInterior)
  const Tc = T
  const starMin = (v: number): number => {
    let m = Math.PI
    for (let k = faces.start[v]!; k < faces.start[v + 1]!; k++)
      m = Math.min(m, planTriangleMinAngle(coords, Tc, faces.list[k]!))
    return m
  }
  const wellShaped = (50 * Math.PI) / 180
  for (let s = 0; s < sweeps; s++) {
    for (let v = 0; v < nV; v++) {
      if (!isInterior[v]) continue
      const a = nb.start[v]!,
        e = nb.start[v + 1]!
      if (e === a) continue
      const before = starMin(v)
      if (before >= wellShaped) continue
      const ox = coords[2 * v]!,
        oy = coords[2 * v + 1]!
      let x = 0,
        y = 0
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
