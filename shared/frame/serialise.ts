/** Frames back to text: the JSON frame file (re-imports unchanged) and CSV rows. */
import type { Frame } from '../types'

/** The frame file of PRODUCT.md, pretty-printed. parseFrameJson(frameToJson(f)) deep-equals f. */
export function frameToJson(frame: Readonly<Frame>): string {
  const file = {
    format: frame.format,
    version: frame.version,
    units: frame.units,
    prestress: { warp: frame.prestress.warp, fill: frame.prestress.fill, warpAngle: frame.prestress.warpAngle },
    mesh: { edgeLength: frame.mesh.edgeLength },
    loops: frame.loops.map((l) => ({
      role: l.role,
      points: l.points.map((p) => ({ id: p.id, x: p.x, y: p.y, z: p.z })),
      edges: l.edges.map((e) => (e.kind === 'cable' ? { kind: e.kind, tension: e.tension } : { kind: e.kind })),
    })),
  }
  return JSON.stringify(file, null, 2) + '\n'
}

/**
 * CSV rows `loop,x,y,z,edge,tension` with a header (loop 0 = outer). Point ids, prestress and
 * edge length are not part of the CSV form: pass them again when importing.
 */
export function frameToCsv(frame: Readonly<Frame>): string {
  const rows = ['loop,x,y,z,edge,tension']
  frame.loops.forEach((l, i) =>
    l.points.forEach((p, k) => {
      const e = l.edges[k]!
      rows.push([i, p.x, p.y, p.z, e.kind, e.kind === 'cable' ? e.tension : ''].join(','))
    }),
  )
  return rows.join('\n') + '\n'
}
