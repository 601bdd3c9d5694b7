/** Strips: the pieces of a split mesh that stay joined across edges that are not seams. */
import { edgeKey, edgeTriangles } from './mesh-edges'
import type { TriangleMesh } from './types'

/** One strip with its own vertex numbering. */
export interface StripMesh {
  /** #n×3 Float64Array, m. */
  vertices: Float64Array
  /** #t×3 Uint32Array into this strip's vertices, orientation as in the surface. */
  triangles: Uint32Array
  /** Surface vertex of each strip vertex (#n) and surface triangle of each strip triangle (#t). */
  surfaceVertex: Int32Array
  surfaceTriangle: Int32Array
  /** Boundary edges as directed pairs (strip vertices, the triangle's own direction): #b×2. */
  boundaryEdges: Int32Array
  /** Per boundary edge: the strip on the other side of the seam, or -1 on the frame. */
  boundaryNeighbour: Int32Array
}

function find(parent: Int32Array, i: number): number {
  while (parent[i] !== i) {
    parent[i] = parent[parent[i]!]!
    i = parent[i]!
  }
  return i
}

/**
 * Cuts the mesh into strips along seamEdges (edge keys). Returns the strips and, per surface
 * triangle, its strip index (#T Int32Array). Strip order is by first triangle (callers re-order).
 */
export function cutStrips(
  mesh: Readonly<TriangleMesh>,
  seamEdges: ReadonlySet<number>,
): { strips: StripMesh[]; triangleStrip: Int32Array } {
  const { triangles, vertices } = mesh
  const count = triangles.length / 3
  const parent = new Int32Array(count).map((_, i) => i)
  const sides = edgeTriangles(triangles)
  for (const [key, [t1, t2]] of sides) {
    if (t2 >= 0 && !seamEdges.has(key)) {
      const r1 = find(parent, t1),
        r2 = find(parent, t2)
      if (r1 !== r2) parent[Math.max(r1, r2)] = Math.min(r1, r2)
    }
  }
  const triangleStrip = new Int32Array(count)
  const rootStrip = new Map<number, number>()
  const members: number[][] = []
  for (let t = 0; t < count; t++) {
    const root = find(parent, t)
    let s = rootStrip.get(root)
    if (s === undefined) {
      s = members.length
      rootStrip.set(root, s)
      members.push([])
    }
    members[s]!.push(t)
    triangleStrip[t] = s
  }
  const strips = members.map((list) => buildStrip(list, triangles, vertices, sides, triangleStrip))
  return { strips, triangleStrip }
}

function buildStrip(
  list: readonly number[],
  triangles: Readonly<Uint32Array>,
  vertices: Readonly<Float64Array>,
  sides: ReadonlyMap<number, [number, number]>,
  triangleStrip: Readonly<Int32Array>,
): StripMesh {
  const local = new Map<number, number>()
  const surfaceVertex: number[] = []
  const localTriangles = new Uint32Array(3 * list.length)
  list.forEach((t, i) => {
    for (let k = 0; k < 3; k++) {
      const g = triangles[3 * t + k]!
      let l = local.get(g)
      if (l === undefined) {
        l = surfaceVertex.length
        local.set(g, l)
        surfaceVertex.push(g)
      }
      localTriangles[3 * i + k] = l
    }
  })
  const own = triangleStrip[list[0]!]!
  const boundary: number[] = []
  const neighbour: number[] = []
  for (const t of list) {
    for (let k = 0; k < 3; k++) {
      const a = triangles[3 * t + k]!,
        b = triangles[3 * t + ((k + 1) % 3)]!
      const [t1, t2] = sides.get(edgeKey(a, b))!
      const other = t1 === t ? t2 : t1
      // a seam that ends inside one strip (a slit) is not opened: README "Known limits"
      if (other >= 0 && triangleStrip[other] === own) continue
      boundary.push(local.get(a)!, local.get(b)!)
      neighbour.push(other < 0 ? -1 : triangleStrip[other]!)
    }
  }
  const v = new Float64Array(3 * surfaceVertex.length)
  surfaceVertex.forEach((g, l) => v.set(vertices.subarray(3 * g, 3 * g + 3), 3 * l))
  return {
    vertices: v,
    triangles: localTriangles,
    surfaceVertex: Int32Array.from(surfaceVertex),
    surfaceTriangle: Int32Array.from(list),
    boundaryEdges: Int32Array.from(boundary),
    boundaryNeighbour: Int32Array.from(neighbour),
  }
}
