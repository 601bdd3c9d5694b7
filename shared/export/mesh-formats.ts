/**
 * Surface meshes as OBJ (Wavefront, 1-based faces) and ASCII STL text, metres. Both carry the
 * caution (OBJ as comment lines, STL in the solid's name: ASCII STL has no comments); figures go
 * to figuresToCsv.
 */
import { CAUTION, CAUTION_TITLE, cautionLines } from '../protocol/caution'
import type { SurfaceResult } from '../types'

/** The STL solid name: the caution rides in it. */
export const STL_SOLID_NAME = `veilroom_surface ${CAUTION_TITLE}: ${CAUTION}`

function fmt(x: number): string {
  return Number.isInteger(x) ? String(x) : x.toPrecision(10).replace(/\.?0+$/, '')
}

/** OBJ text: `v x y z` lines then `f i j k` (1-based), counter-clockwise as in the result. */
export function toObj(result: Readonly<Pick<SurfaceResult, 'vertices' | 'triangles'>>): string {
  const lines = [`# Veilroom surface, metres.\n${cautionLines('# ').trimEnd()}`]
  for (const [x, y, z] of result.vertices) lines.push(`v ${fmt(x)} ${fmt(y)} ${fmt(z)}`)
  for (const [a, b, c] of result.triangles) lines.push(`f ${a + 1} ${b + 1} ${c + 1}`)
  return lines.join('\n') + '\n'
}

/** ASCII STL text with one facet per triangle and its unit normal (right-hand rule). */
export function toStl(result: Readonly<Pick<SurfaceResult, 'vertices' | 'triangles'>>, name = STL_SOLID_NAME): string {
  const lines = [`solid ${name}`]
  const V = result.vertices
  for (const [a, b, c] of result.triangles) {
    const p = V[a]!,
      q = V[b]!,
      r = V[c]!
    const u = [q[0] - p[0], q[1] - p[1], q[2] - p[2]],
      w = [r[0] - p[0], r[1] - p[1], r[2] - p[2]]
    const n = [u[1]! * w[2]! - u[2]! * w[1]!, u[2]! * w[0]! - u[0]! * w[2]!, u[0]! * w[1]! - u[1]! * w[0]!]
    const len = Math.hypot(n[0]!, n[1]!, n[2]!) || 1
    lines.push(`  facet normal ${n.map((x) => fmt(x / len)).join(' ')}`, '    outer loop')
    for (const s of [p, q, r]) lines.push(`      vertex ${fmt(s[0])} ${fmt(s[1])} ${fmt(s[2])}`)
    lines.push('    endloop', '  endfacet')
  }
  lines.push(`endsolid ${name}`)
  return lines.join('\n') + '\n'
}
