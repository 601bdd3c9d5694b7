/** From a schema-checked frame file to a Frame: defaults filled in, ids given, edges completed. */
import type { Frame, FrameEdge } from '../types'
import { FrameError } from './frame-error'
import { DEFAULT_PRESTRESS, type FrameFile } from './schema'

/**
 * Fill defaults: prestress 3 kN/m both ways, warp direction along +x (warpAngle 0); edgeLength = plan diagonal / 40; edges all rigid;
 * ids `p<n>` for the outer loop and `h<loop>p<n>` for holes (1-based). Rigid edges drop a tension.
 */
export function normaliseFrameFile(file: Readonly<FrameFile>): Frame {
  let minX = Infinity,
    minY = Infinity,
    maxX = -Infinity,
    maxY = -Infinity
  for (const loop of file.loops) {
    for (const p of loop.points) {
      minX = Math.min(minX, p.x)
      maxX = Math.max(maxX, p.x)
      minY = Math.min(minY, p.y)
      maxY = Math.max(maxY, p.y)
    }
  }
  const diagonal = Number.isFinite(maxX) ? Math.hypot(maxX - minX, maxY - minY) : 0
  const loops = file.loops.map((loop, l) => {
    if (loop.edges && loop.edges.length !== loop.points.length) {
      throw new FrameError(
        'invalid-field',
        `has ${loop.edges.length} edges for ${loop.points.length} points; edge i joins point i to point i+1, so the counts must be equal`,
        `loops[${l}].edges`,
      )
    }
    const edges: FrameEdge[] = loop.points.map((_, i) => {
      const e = loop.edges?.[i]
      if (!e || e.kind === 'rigid') return { kind: 'rigid' }
      return e.tension === undefined ? { kind: 'cable' } : { kind: 'cable', tension: e.tension }
    })
    const prefix = loop.role === 'outer' ? 'p' : `h${l}p`
    const points = loop.points.map((p, i) => ({ id: p.id ?? `${prefix}${i + 1}`, x: p.x, y: p.y, z: p.z }))
    return { role: loop.role, points, edges }
  })
  return {
    format: 'veilroom-frame',
    version: 1,
    units: 'm',
    prestress: file.prestress
      ? { warp: file.prestress.warp, fill: file.prestress.fill, warpAngle: file.prestress.warpAngle ?? 0 }
      : { warp: DEFAULT_PRESTRESS, fill: DEFAULT_PRESTRESS, warpAngle: 0 },
    mesh: file.mesh ?? { edgeLength: diagonal > 0 ? diagonal / 40 : 1 },
    loops,
  }
}
