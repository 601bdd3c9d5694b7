/**
 * Plan meshing of a frame: the domain outer loop minus holes, triangulated at the frame's target
 * edge length h with a hexagonal interior lattice and a constrained Delaunay triangulation.
 */
import Delaunator from 'delaunator'
import Constrainautor from '@kninnug/constrainautor'
import type { Frame, MembraneMesh } from '../types'
import { resampleLoops } from './boundary'
import { domainTriangles } from './domain-triangles'
import { latticePoints } from './lattice'
import { meshPlanMinAngle, meshTopologyKey } from './quantities'
import { orient } from './plan-geometry'
import { MeshError } from './mesh-error'
import { frameNeedsParametricMesh } from '../frame/classify'
import { buildVertexNeighbours, smoothInterior } from './smoothing'

/** How far interior lattice points stay off the boundary, in units of h (0.7 measured best for min angle). */
const BOUNDARY_GAP = 0.7
const SMOOTHING_SWEEPS = 3

/**
 * Mesh the plan domain of `frame` (see README.md). Vertices: boundary first (loop by loop, frame
 * point order), then interior. Known limits: loops overlapping in plan need meshParametric; very
 * short frame edges (≪ h) give small angles next to them (reported in minAngle).
 */
export function meshFrame(frame: Readonly<Frame>): MembraneMesh {
  if (frameNeedsParametricMesh(frame)) {
    throw new MeshError('loops[1]', 'overlaps the outer loop in plan (rings one above the other): use meshParametric')
  }
  const h = frame.mesh.edgeLength
  const b = resampleLoops(frame, (_l, _e, lp) => Math.round(lp / h))
  const nB = b.loopOf.length
  const segments: [number, number][] = []
  for (const loop of b.loops) {
    for (let i = 0; i < loop.length; i++) segments.push([loop[i]!, loop[(i + 1) % loop.length]!])
  }
  const inner = latticePoints(b.xyz, segments, h, BOUNDARY_GAP * h)
  const nV = nB + inner.length / 2
  // Four box corners well outside the frame come last: the convex hull is then the box, never a
  // straight run of nearly collinear boundary samples (which constrainautor cannot constrain).
  const coords = new Float64Array(2 * (nV + 4))
  for (let i = 0; i < nB; i++) {
    coords[2 * i] = b.xyz[3 * i]!
    coords[2 * i + 1] = b.xyz[3 * i + 1]!
  }
  coords.set(inner, 2 * nB)
  coords.set(boxCorners(b.xyz, h), 2 * nV)

  const del = new Delaunator(coords)
  const con = new Constrainautor(del)
  for (const [p, q] of segments) con.constrainOne(p, q)
  if (con.untriangulatedPoints().length > 0) {
    throw new MeshError('mesh', 'frame points lie too close together for the target edge length')
  }
  const nextOnLoop = new Int32Array(nV + 4).fill(-1)
  for (const [p, q] of segments) nextOnLoop[p] = q

  const keep = domainTriangles(del.triangles, del.halfedges, nextOnLoop)
  const triangles = new Uint32Array(3 * keep.length)
  keep.forEach((t, k) => {
    const a = del.triangles[3 * t]!
    let bb = del.triangles[3 * t + 1]!,
      c = del.triangles[3 * t + 2]!
    if (
      orient(
        coords[2 * a]!,
        coords[2 * a + 1]!,
        coords[2 * bb]!,
        coords[2 * bb + 1]!,
        coords[2 * c]!,
        coords[2 * c + 1]!,
      ) < 0
    ) {
      const s = bb
      bb = c
      c = s
    }
    triangles[3 * k] = a
    triangles[3 * k + 1] = bb
    triangles[3 * k + 2] = c
  })
  const neighbours = buildVertexNeighbours(nV, triangles)
  // Only the band next to the boundary is irregular; the hexagonal lattice beyond it is already ideal.
  const isInterior = boundaryBand(nB, neighbours, 2)
  // Smart smoothing never turns a triangle over, so the orientation above stays valid.
  smoothInterior(coords.subarray(0, 2 * nV), neighbours, isInterior, triangles, SMOOTHING_SWEEPS)

  const vertices = new Float64Array(3 * nV)
  for (let v = 0; v < nV; v++) {
    vertices[3 * v] = coords[2 * v]!
    vertices[3 * v + 1] = coords[2 * v + 1]!
    vertices[3 * v + 2] = v < nB ? b.xyz[3 * v + 2]! : 0
  }
  firstGuessHeights(vertices, nB, frame, neighbours)

  const vertexLoops = new Int32Array(nV).fill(-1)
  const vertexEdges = new Int32Array(nV).fill(-1)
  const vertexPoints = new Int32Array(nV).fill(-1)
  for (let i = 0; i < nB; i++) {
    vertexLoops[i] = b.loopOf[i]!
    vertexEdges[i] = b.edgeOf[i]!
    vertexPoints[i] = b.pointOf[i]!
  }
  return {
    vertices,
    triangles,
    vertexLoops,
    vertexEdges,
    vertexPoints,
    boundaryLoops: b.loops.map((l) => Uint32Array.from(l)),
    minAngle: meshPlanMinAngle(vertices, triangles),
    topologyKey: meshTopologyKey(nV, triangles),
  }
}

/** Corners (#4×2) of the samples' bounding box grown by half its size plus h on every side. */
function boxCorners(xyz: readonly number[], h: number): number[] {
  let minX = Infinity,
    minY = Infinity,
    maxX = -Infinity,
    maxY = -Infinity
  for (let i = 0; i < xyz.length; i += 3) {
    minX = Math.min(minX, xyz[i]!)
    maxX = Math.max(maxX, xyz[i]!)
    minY = Math.min(minY, xyz[i + 1]!)
    maxY = Math.max(maxY, xyz[i + 1]!)
  }
  const grow = Math.max(maxX - minX, maxY - minY) / 2 + h
  return [minX - grow, minY - grow, maxX + grow, minY - grow, maxX + grow, maxY + grow, minX - grow, maxY + grow]
}

/** Interior vertices (index ≥ nB) within `rings` neighbour rings of a boundary vertex: 1, else 0. */
function boundaryBand(nB: number, nb: { start: Int32Array; list: Int32Array }, rings: number): Uint8Array {
  const nV = nb.start.length - 1
  const depth = new Int32Array(nV).fill(-1)
  let front: number[] = []
  for (let v = 0; v < nB; v++) {
    depth[v] = 0
    front.push(v)
  }
  for (let r = 1; r <= rings; r++) {
    const next: number[] = []
    for (const v of front) {
      for (let k = nb.start[v]!; k < nb.start[v + 1]!; k++) {
        const w = nb.list[k]!
        if (depth[w] !== -1) continue
        depth[w] = r
        next.push(w)
      }
    }
    front = next
  }
  const band = new Uint8Array(nV)
  for (let v = nB; v < nV; v++) band[v] = depth[v]! > 0 ? 1 : 0
  return band
}

/**
 * Interior heights: inverse-distance blend of the frame points (when there are few) relaxed by
 * Laplacian sweeps — only a start, the solver replaces it.
 */
function firstGuessHeights(
  V: Float64Array,
  nB: number,
  frame: Readonly<Frame>,
  nb: { start: Int32Array; list: Int32Array },
): void {
  const pts = frame.loops.flatMap((l) => l.points)
  const nV = V.length / 3
  let mean = 0
  for (let i = 0; i < nB; i++) mean += V[3 * i + 2]! / nB
  for (let v = nB; v < nV; v++) {
    if (pts.length > 64) {
      V[3 * v + 2] = mean
      continue
    }
    let sw = 0,
      sz = 0
    for (const p of pts) {
      const w = 1 / Math.max((V[3 * v]! - p.x) ** 2 + (V[3 * v + 1]! - p.y) ** 2, 1e-30)
      sw += w
      sz += w * p.z
    }
    V[3 * v + 2] = sz / sw
  }
  for (let s = 0; s < 2; s++) {
    for (let v = nB; v < nV; v++) {
      let z = 0
      const a = nb.start[v]!,
        e = nb.start[v + 1]!
      for (let k = a; k < e; k++) z += V[3 * nb.list[k]! + 2]!
      if (e > a) V[3 * v + 2] = z / (e - a)
    }
  }
}
