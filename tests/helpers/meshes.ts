import type { MembraneMesh } from '../../shared/types'

/**
 * Structured test meshes built here so that solver tests do not depend on the plan mesher.
 * A (nu+1)×(nv+1) lattice of parameters (s, t) ∈ [0,1]², mapped to 3D by `map`; quads split along
 * alternating diagonals (a "union jack"-free criss-cross that keeps the mesh symmetric on average).
 * periodic: s wraps (annuli, tubes): the column s = 1 is the column s = 0.
 * Boundary: t = 0 is loop 0 (outer), t = 1 is loop 1 (hole) when periodic; otherwise the whole
 * lattice rim is loop 0, walked counter-clockwise in (s, t).
 */
export function structuredMesh(
  nu: number,
  nv: number,
  map: (s: number, t: number) => [number, number, number],
  periodic = false,
): MembraneMesh {
  const cols = periodic ? nu : nu + 1
  const index = (i: number, j: number): number => j * cols + (periodic ? i % nu : i)
  const vertexCount = cols * (nv + 1)
  const vertices = new Float64Array(3 * vertexCount)
  for (let j = 0; j <= nv; j++) {
    for (let i = 0; i < cols; i++) {
      const p = map(i / nu, j / nv)
      vertices.set(p, 3 * index(i, j))
    }
  }
  const triangles: number[] = []
  for (let j = 0; j < nv; j++) {
    for (let i = 0; i < nu; i++) {
      const a = index(i, j),
        b = index(i + 1, j),
        c = index(i + 1, j + 1),
        d = index(i, j + 1)
      if ((i + j) % 2 === 0) triangles.push(a, b, c, a, c, d)
      else triangles.push(a, b, d, b, c, d)
    }
  }
  const vertexLoops = new Int32Array(vertexCount).fill(-1)
  const vertexEdges = new Int32Array(vertexCount).fill(-1)
  const vertexPoints = new Int32Array(vertexCount).fill(-1)
  const boundaryLoops: Uint32Array[] = []
  if (periodic) {
    const outer: number[] = []
    const hole: number[] = []
    for (let i = 0; i < nu; i++) {
      outer.push(index(i, 0))
      hole.push(index(i, nv))
    }
    boundaryLoops.push(Uint32Array.from(outer), Uint32Array.from(hole))
  } else {
    const rim: number[] = []
    for (let i = 0; i < nu; i++) rim.push(index(i, 0))
    for (let j = 0; j < nv; j++) rim.push(index(nu, j))
    for (let i = nu; i > 0; i--) rim.push(index(i, nv))
    for (let j = nv; j > 0; j--) rim.push(index(0, j))
    boundaryLoops.push(Uint32Array.from(rim))
  }
  boundaryLoops.forEach((loop, l) => loop.forEach((v) => (vertexLoops[v] = l)))
  return {
    vertices,
    triangles: Uint32Array.from(triangles),
    vertexLoops,
    vertexEdges,
    vertexPoints,
    boundaryLoops,
    minAngle: 0,
    topologyKey: `structured:${nu}x${nv}:${periodic}`,
  }
}

/** Rotation by `angle` (radians) about the z axis followed by a shift: places frames off the origin. */
export function placed(angle: number, dx: number, dy: number): (x: number, y: number) => [number, number] {
  const c = Math.cos(angle),
    s = Math.sin(angle)
  return (x, y) => [c * x - s * y + dx, s * x + c * y + dy]
}

/** Isotropic-ish annulus mesh: angular count chosen so radial and angular steps match at mid radius. */
export function annulusMesh(r1: number, r2: number, nr: number, z: (r: number, theta: number) => number): MembraneMesh {
  const nu = Math.max(8, Math.round((Math.PI * (r1 + r2)) / ((r2 - r1) / nr)))
  return structuredMesh(
    nu,
    nr,
    (s, t) => {
      const r = r2 + (r1 - r2) * t
      const th = 2 * Math.PI * s
      return [r * Math.cos(th), r * Math.sin(th), z(r, th)]
    },
    true,
  )
}

/** True for boundary vertices of a test mesh (every loop rigid). */
export function rimMask(mesh: MembraneMesh): Uint8Array {
  const fixed = new Uint8Array(mesh.vertexLoops.length)
  mesh.vertexLoops.forEach((l, v) => (fixed[v] = l >= 0 ? 1 : 0))
  return fixed
}

/**
 * Disc of radius 1 from the m×m lattice by the square-to-disc map of Fong ("Analytical methods for
 * squaring the disc", 2014): (x, y) ↦ (x√(1 − y²/2), y√(1 − x²/2)). Mapped on by `map`.
 */
export function discMesh(m: number, map: (x: number, y: number) => [number, number, number]): MembraneMesh {
  return structuredMesh(m, m, (s, t) => {
    const x = 2 * s - 1,
      y = 2 * t - 1
    return map(x * Math.sqrt(1 - (y * y) / 2), y * Math.sqrt(1 - (x * x) / 2))
  })
}

/** Largest |a_v − b_v| over vertices. */
export function maxDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let worst = 0
  for (let v = 0; v < a.length; v++) worst = Math.max(worst, Math.abs(a[v]! - b[v]!))
  return worst
}
