import type { Frame, MembraneMesh } from '../types'

/** What the spatial path needs from a frame beyond the mesh: the held set and the cables. */
export interface FrameConstraints {
  /** #V Uint8Array: 1 = held. Frame points and rigid-edge vertices are held; cable interiors move. */
  isFixed: Uint8Array
  /** #S×2 Uint32Array: boundary segments on cable edges, in loop order. */
  cableSegments: Uint32Array
  /** #S Float64Array: tension T of the segment's cable, kN. */
  cableTensions: Float64Array
}

/**
 * Reads the held vertices and cable segments off a mesh of `frame` (vertexLoops/vertexEdges/
 * vertexPoints as documented in types.ts). A boundary vertex inside a cable edge is free; a
 * boundary segment (a → b in loop order) belongs to the edge that a lies on.
 */
export function frameConstraints(mesh: Readonly<MembraneMesh>, frame: Readonly<Frame>): FrameConstraints {
  const vertexCount = mesh.vertices.length / 3
  const isFixed = new Uint8Array(vertexCount)
  const isCableEdge = (loop: number, edge: number): boolean => frame.loops[loop]?.edges[edge]?.kind === 'cable'
  for (let v = 0; v < vertexCount; v++) {
    const loop = mesh.vertexLoops[v]!
    if (loop < 0) continue
    isFixed[v] = mesh.vertexPoints[v]! >= 0 || !isCableEdge(loop, mesh.vertexEdges[v]!) ? 1 : 0
  }
  const segments: number[] = []
  const tensions: number[] = []
  mesh.boundaryLoops.forEach((ring, loop) => {
    for (let k = 0; k < ring.length; k++) {
      const a = ring[k]!,
        b = ring[(k + 1) % ring.length]!
      const edge = mesh.vertexEdges[a]!
      if (!isCableEdge(loop, edge)) continue
      segments.push(a, b)
      tensions.push(frame.loops[loop]!.edges[edge]!.tension ?? 0)
    }
  })
  return {
    isFixed,
    cableSegments: Uint32Array.from(segments),
    cableTensions: Float64Array.from(tensions),
  }
}

/** Isotropic prestress σ (kN/m) used by the solver: the mean of warp and fill. */
export function isotropicPrestress(frame: Readonly<Frame>): number {
  return (frame.prestress.warp + frame.prestress.fill) / 2
}

/** A key that changes when anything but point coordinates and tensions changes. */
export function frameStructureKey(frame: Readonly<Frame>): string {
  return JSON.stringify([
    frame.mesh.edgeLength,
    frame.loops.map((l) => [l.role, l.points.length, l.edges.map((e) => e.kind)]),
  ])
}
