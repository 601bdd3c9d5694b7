/** Small frame files for the frame, mesh, figures and CLI tests (our own scenarios). */
import type { Frame } from '../../shared/types'
import { parseFrameJson } from '../../shared/frame'

export type Pt = { x: number; y: number; z: number }

/** A square of side s with lower-left corner (x0, y0), counter-clockwise, heights from z(i). */
export function squareLoop(s: number, x0 = 0, y0 = 0, z: (i: number) => number = () => 0): Pt[] {
  return [
    [0, 0],
    [s, 0],
    [s, s],
    [0, s],
  ].map(([x, y], i) => ({ x: x0 + x!, y: y0 + y!, z: z(i) }))
}

/** n points on a circle of radius r about (cx, cy) at height z, clockwise when cw. */
export function circleLoop(n: number, r: number, cx = 0, cy = 0, z = 0, cw = false): Pt[] {
  return Array.from({ length: n }, (_, i) => {
    const a = ((cw ? -2 : 2) * Math.PI * i) / n
    return { x: cx + r * Math.cos(a), y: cy + r * Math.sin(a), z }
  })
}

export function frameFile(
  outer: Pt[],
  holes: Pt[][] = [],
  edgeLength = 0.5,
  extra: Record<string, unknown> = {},
): Record<string, unknown> {
  return {
    format: 'veilroom-frame',
    version: 1,
    units: 'm',
    prestress: { warp: 3, fill: 3, warpAngle: 0 },
    mesh: { edgeLength },
    loops: [{ role: 'outer', points: outer }, ...holes.map((points) => ({ role: 'hole', points }))],
    ...extra,
  }
}

export function frame(outer: Pt[], holes: Pt[][] = [], edgeLength = 0.5): Frame {
  return parseFrameJson(frameFile(outer, holes, edgeLength))
}
