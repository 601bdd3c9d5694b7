/**
 * Per-face and per-vertex quantities of a triangle mesh, shared by the solver and the figures.
 * Conventions: V is a #V×3 Float64Array of positions in metres, T a #T×3 Uint32Array of vertex
 * indices. Outputs are written into `out` (allocated by the caller) and returned.
 */

/**
 * Twice the vector area of face t (edge ab × edge ac: right-hand normal, length = 2 × area, m²)
 * written to o[k..k+2]. Takes any array of positions (#V×3) and indices (#T×3), so the client's
 * Float32 surfaces use it as the solver's Float64 meshes do.
 */
export function faceCross(V: ArrayLike<number>, T: ArrayLike<number>, t: number, o: Float64Array, k: number): void {
  const a = 3 * T[3 * t]!
  const b = 3 * T[3 * t + 1]!
  const c = 3 * T[3 * t + 2]!
  const ux = V[b]! - V[a]!,
    uy = V[b + 1]! - V[a + 1]!,
    uz = V[b + 2]! - V[a + 2]!
  const vx = V[c]! - V[a]!,
    vy = V[c + 1]! - V[a + 1]!,
    vz = V[c + 2]! - V[a + 2]!
  o[k] = uy * vz - uz * vy
  o[k + 1] = uz * vx - ux * vz
  o[k + 2] = ux * vy - uy * vx
}

/** Face areas, m²: out is #T. */
export function faceAreas(out: Float64Array, V: Readonly<Float64Array>, T: Readonly<Uint32Array>): Float64Array {
  const n = T.length / 3
  const c = new Float64Array(3)
  for (let t = 0; t < n; t++) {
    faceCross(V, T, t, c, 0)
    out[t] = 0.5 * Math.hypot(c[0]!, c[1]!, c[2]!)
  }
  return out
}

/** Face area vectors: #T×3, direction = right-hand normal, length = face area (m²). */
export function faceAreaVectors(out: Float64Array, V: Readonly<Float64Array>, T: Readonly<Uint32Array>): Float64Array {
  const n = T.length / 3
  for (let t = 0; t < n; t++) {
    faceCross(V, T, t, out, 3 * t)
    out[3 * t]! *= 0.5
    out[3 * t + 1]! *= 0.5
    out[3 * t + 2]! *= 0.5
  }
  return out
}

/** Unit face normals: #T×3 (zero vector for degenerate faces). */
export function faceNormals(out: Float64Array, V: Readonly<Float64Array>, T: Readonly<Uint32Array>): Float64Array {
  faceAreaVectors(out, V, T)
  for (let k = 0; k < out.length; k += 3) {
    const len = Math.hypot(out[k]!, out[k + 1]!, out[k + 2]!)
    const s = len > 0 ? 1 / len : 0
    out[k]! *= s
    out[k + 1]! *= s
    out[k + 2]! *= s
  }
  return out
}

/** Signed plan (xy) face areas, m²: #T, positive for counter-clockwise seen from above. */
export function planFaceAreas(out: Float64Array, V: Readonly<Float64Array>, T: Readonly<Uint32Array>): Float64Array {
  const n = T.length / 3
  for (let t = 0; t < n; t++) {
    const a = 3 * T[3 * t]!,
      b = 3 * T[3 * t + 1]!,
      c = 3 * T[3 * t + 2]!
    out[t] = 0.5 * ((V[b]! - V[a]!) * (V[c + 1]! - V[a + 1]!) - (V[b + 1]! - V[a + 1]!) * (V[c]! - V[a]!))
  }
  return out
}

/** Angle at corner k (0..2) of face t, radians. */
export function cornerAngle(V: Readonly<Float64Array>, T: Readonly<Uint32Array>, t: number, k: number): number {
  const p = 3 * T[3 * t + k]!
  const q = 3 * T[3 * t + ((k + 1) % 3)]!
  const r = 3 * T[3 * t + ((k + 2) % 3)]!
  const ux = V[q]! - V[p]!,
    uy = V[q + 1]! - V[p + 1]!,
    uz = V[q + 2]! - V[p + 2]!
  const vx = V[r]! - V[p]!,
    vy = V[r + 1]! - V[p + 1]!,
    vz = V[r + 2]! - V[p + 2]!
  const dot = ux * vx + uy * vy + uz * vz
  const cross = Math.hypot(uy * vz - uz * vy, uz * vx - ux * vz, ux * vy - uy * vx)
  return Math.atan2(cross, dot)
}

/** Smallest corner angle of each face, degrees: out is #T. */
export function faceMinAngles(out: Float64Array, V: Readonly<Float64Array>, T: Readonly<Uint32Array>): Float64Array {
  const n = T.length / 3
  for (let t = 0; t < n; t++) {
    out[t] = (Math.min(cornerAngle(V, T, t, 0), cornerAngle(V, T, t, 1), cornerAngle(V, T, t, 2)) * 180) / Math.PI
  }
  return out
}

/** Smallest corner angle over the mesh, degrees (180 for an empty mesh). */
export function meshMinAngle(V: Readonly<Float64Array>, T: Readonly<Uint32Array>): number {
  const a = faceMinAngles(new Float64Array(T.length / 3), V, T)
  let m = 180
  for (let t = 0; t < a.length; t++) m = Math.min(m, a[t]!)
  return m
}

/**
 * Smallest plan (xy) corner angle over the mesh, degrees; V: #V×3 (z ignored). The smallest angle
 * of a triangle is opposite its shortest edge, so one atan2 per face.
 */
export function meshPlanMinAngle(V: Readonly<Float64Array>, T: Readonly<Uint32Array>): number {
  let m = Math.PI
  for (let t = 0; t < T.length; t += 3) {
    let best = 0,
      shortest = Infinity
    for (let k = 0; k < 3; k++) {
      const q = 3 * T[t + ((k + 1) % 3)]!,
        r = 3 * T[t + ((k + 2) % 3)]!
      const l2 = (V[r]! - V[q]!) ** 2 + (V[r + 1]! - V[q + 1]!) ** 2
      if (l2 < shortest) {
        shortest = l2
        best = k
      }
    }
    const p = 3 * T[t + best]!,
      q = 3 * T[t + ((best + 1) % 3)]!,
      r = 3 * T[t + ((best + 2) % 3)]!
    const ux = V[q]! - V[p]!,
      uy = V[q + 1]! - V[p + 1]!,
      vx = V[r]! - V[p]!,
      vy = V[r + 1]! - V[p + 1]!
    const ang = Math.atan2(Math.abs(ux * vy - uy * vx), ux * vx + uy * vy)
    if (ang < m) m = ang
  }
  return (m * 180) / Math.PI
}

/**
 * Cotangent weights per face corner: #T×3, entry 3t+k = ½·cot(angle at corner k), the weight that
 * corner contributes to the opposite edge (T[3t+k+1], T[3t+k+2]) of the cotan Laplacian.
 */
export function edgeCotanWeights(V: Readonly<Float64Array>, T: Readonly<Uint32Array>): Float64Array {
  const out = new Float64Array(T.length)
  const n = T.length / 3
  for (let t = 0; t < n; t++) {
    for (let k = 0; k < 3; k++) {
      const p = 3 * T[3 * t + k]!
      const q = 3 * T[3 * t + ((k + 1) % 3)]!
      const r = 3 * T[3 * t + ((k + 2) % 3)]!
      const ux = V[q]! - V[p]!,
        uy = V[q + 1]! - V[p + 1]!,
        uz = V[q + 2]! - V[p + 2]!
      const vx = V[r]! - V[p]!,
        vy = V[r + 1]! - V[p + 1]!,
        vz = V[r + 2]! - V[p + 2]!
      const cross = Math.hypot(uy * vz - uz * vy, uz * vx - ux * vz, ux * vy - uy * vx)
      out[3 * t + k] = cross > 0 ? (0.5 * (ux * vx + uy * vy + uz * vz)) / cross : 0
    }
  }
  return out
}

/**
 * Angle defect 2π − Σ corner angles per vertex, radians: out is #V (0 where isBoundary[v] ≠ 0).
 * The defect is the integrated Gaussian curvature around an interior vertex (Gauss–Bonnet).
 */
export function vertexAngleDefects(
  out: Float64Array,
  V: Readonly<Float64Array>,
  T: Readonly<Uint32Array>,
  isBoundary: Readonly<ArrayLike<number>>,
): Float64Array {
  const nV = V.length / 3
  out.fill(2 * Math.PI, 0, nV)
  const n = T.length / 3
  for (let t = 0; t < n; t++) {
    for (let k = 0; k < 3; k++) out[T[3 * t + k]!]! -= cornerAngle(V, T, t, k)
  }
  for (let v = 0; v < nV; v++) if (isBoundary[v]) out[v] = 0
  return out
}

/** A key equal for equal connectivity (vertex count + triangle list; FNV-1a over the indices). */
export function meshTopologyKey(nV: number, T: Readonly<Uint32Array>): string {
  let h = 0x811c9dc5
  for (let i = 0; i < T.length; i++) {
    h ^= T[i]!
    h = Math.imul(h, 0x01000193)
  }
  return `${nV}:${T.length / 3}:${(h >>> 0).toString(16)}`
}

/**
 * Rise per metre of plan run of the plan direction (ax, ay) projected vertically onto a plane with
 * unit normal (nx, ny, nz): the direction on the face is (ax, ay, rise). Undefined (±∞) for a
 * standing face; callers skip faces with |nz| below their own limit.
 */
export const planDirectionRise = (nx: number, ny: number, nz: number, ax: number, ay: number): number =>
  -(nx * ax + ny * ay) / nz
