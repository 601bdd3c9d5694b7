/**
 * Cable figures and forces on frame points from the solved membrane.
 *
 * Membrane pull on a boundary segment ab of triangle abc: σ·|ab| along the in-plane conormal of ab
 * pointing into the triangle (prestress σ in kN/m, isotropic: the mean of warp and fill), shared
 * half to a and half to b. Along a rigid edge the pulls of its vertices go to the edge's two frame
 * points in proportion to position (a beam spanning between them). At a cable edge the frame point
 * takes the cable tension along the cable's first segment; the membrane pull on the cable's inner
 * nodes is carried by the cable. Result: the force the surface puts on each frame point (kN) — the
 * support reaction is its negative.
 */
import type { CableFigure, Frame, MembraneMesh } from '../types'

type Vec = [number, number, number]

function sub(V: Readonly<Float64Array>, a: number, b: number): Vec {
  return [V[3 * a]! - V[3 * b]!, V[3 * a + 1]! - V[3 * b + 1]!, V[3 * a + 2]! - V[3 * b + 2]!]
}
function norm(v: Vec): number {
  return Math.hypot(v[0], v[1], v[2])
}

/** Vertices of loop l from frame point e to frame point e+1 inclusive, in loop order. */
export function edgeVertices(mesh: Readonly<MembraneMesh>, l: number, e: number): number[] {
  const B = mesh.boundaryLoops[l]!
  const start = Array.prototype.findIndex.call(B, (v: number) => mesh.vertexPoints[v] === e)
  const out: number[] = []
  for (let k = start; ; k++) {
    const v = B[k % B.length]!
    out.push(v)
    if (k > start && mesh.vertexPoints[v]! >= 0) break
  }
  return out
}

/** Length, force (= the given tension) and largest sag from the chord of every cable edge. */
export function cableFigures(mesh: Readonly<MembraneMesh>, frame: Readonly<Frame>): CableFigure[] {
  const V = mesh.vertices
  const out: CableFigure[] = []
  frame.loops.forEach((loop, l) =>
    loop.edges.forEach((edge, e) => {
      if (edge.kind !== 'cable') return
      const vs = edgeVertices(mesh, l, e)
      const a = vs[0]!,
        b = vs[vs.length - 1]!
      const chord = sub(V, b, a)
      const c = norm(chord)
      let length = 0,
        sag = 0
      for (let k = 0; k < vs.length; k++) {
        if (k > 0) length += norm(sub(V, vs[k]!, vs[k - 1]!))
        const d = sub(V, vs[k]!, a)
        const t = c > 0 ? Math.max(0, Math.min(1, (d[0] * chord[0] + d[1] * chord[1] + d[2] * chord[2]) / (c * c))) : 0
        sag = Math.max(sag, Math.hypot(d[0] - t * chord[0], d[1] - t * chord[1], d[2] - t * chord[2]))
      }
      out.push({ loop: l, edge: e, length, force: edge.tension ?? 0, sag })
    }),
  )
  return out
}

/** [loop, point, fx, fy, fz] per frame point, kN (force on the frame point; see the file comment). */
export function frameReactions(
  mesh: Readonly<MembraneMesh>,
  frame: Readonly<Frame>,
): [number, number, number, number, number][] {
  const V = mesh.vertices
  const nV = V.length / 3
  const sigma = (frame.prestress.warp + frame.prestress.fill) / 2
  const pull = new Float64Array(3 * nV)
  const segOpposite = new Map<number, number>()
  const key = (a: number, b: number): number => Math.min(a, b) * nV + Math.max(a, b)
  for (const B of mesh.boundaryLoops)
    for (let k = 0; k < B.length; k++) segOpposite.set(key(B[k]!, B[(k + 1) % B.length]!), -1)
  const T = mesh.triangles
  for (let t = 0; t < T.length; t += 3) {
    for (let k = 0; k < 3; k++) {
      const a = T[t + k]!,
        b = T[t + ((k + 1) % 3)]!,
        c = T[t + ((k + 2) % 3)]!
      if (!segOpposite.has(key(a, b))) continue
      const ab = sub(V, b, a),
        ac = sub(V, c, a)
      const L = norm(ab)
      if (L === 0) continue
      const s = (ac[0] * ab[0] + ac[1] * ab[1] + ac[2] * ab[2]) / (L * L)
      const m: Vec = [ac[0] - s * ab[0], ac[1] - s * ab[1], ac[2] - s * ab[2]]
      const mn = norm(m)
      if (mn === 0) continue
      for (const v of [a, b]) for (let d = 0; d < 3; d++) pull[3 * v + d]! += (0.5 * sigma * L * m[d]!) / mn
    }
  }
  const out: [number, number, number, number, number][] = []
  frame.loops.forEach((loop, l) => {
    const F = loop.points.map((): Vec => [0, 0, 0])
    const n = loop.points.length
    loop.edges.forEach((edge, e) => {
      const vs = edgeVertices(mesh, l, e)
      const a = vs[0]!,
        b = vs[vs.length - 1]!
      const fa = F[e]!,
        fb = F[(e + 1) % n]!
      if (edge.kind === 'cable') {
        const T0 = edge.tension ?? 0
        const da = sub(V, vs[1]!, a),
          db = sub(V, vs[vs.length - 2]!, b)
        for (let d = 0; d < 3; d++) {
          fa[d]! += (T0 * da[d]!) / norm(da) + pull[3 * a + d]!
          fb[d]! += (T0 * db[d]!) / norm(db)
        }
        return
      }
      const total = norm(sub(V, b, a))
      for (let k = 0; k < vs.length - 1; k++) {
        const v = vs[k]!
        const t = k === 0 || total === 0 ? 0 : norm(sub(V, v, a)) / total
        for (let d = 0; d < 3; d++) {
          fa[d]! += (1 - t) * pull[3 * v + d]!
          fb[d]! += t * pull[3 * v + d]!
        }
      }
    })
    F.forEach((f, i) => out.push([l, i, f[0], f[1], f[2]]))
  })
  return out
}
