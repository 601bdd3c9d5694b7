/**
 * The numbering a person reads, the same in the workbench, the report and the figures CSV:
 * loops are "Outer", then "Hole 1", "Hole 2", … in frame order; points "P1"… and edges "E1"… are
 * 1-based within their loop, edge Ei joining Pi to Pi+1 (the last wraps to P1).
 */

/** Loop names by frame loop index. */
export function loopNames(loops: readonly { role: 'outer' | 'hole' }[]): string[] {
  let hole = 0
  return loops.map((l) => (l.role === 'outer' ? 'Outer' : `Hole ${++hole}`))
}

/** "P3" for frame point index 2, within its loop. */
export const pointLabel = (point: number): string => `P${point + 1}`

/** "Outer P3" for frame point index 2 of loop "Outer". */
export const pointName = (loop: string, point: number): string => `${loop} ${pointLabel(point)}`

/** The drawings' short form, where labels crowd: "P3" on the outer loop, "H1 P3" on hole 1; by loop, then point. */
export function shortPointNames(loops: readonly { role: 'outer' | 'hole'; points: readonly unknown[] }[]): string[][] {
  let hole = 0
  return loops.map((l) => {
    const prefix = l.role === 'outer' ? '' : `H${++hole} `
    return l.points.map((_, i) => prefix + pointLabel(i))
  })
}

/** "Hole 1 E4" for edge index 3 of loop "Hole 1". */
export const edgeName = (loop: string, edge: number): string => `${loop} E${edge + 1}`

/**
 * The name of frame loop `index` of a valid frame, whose outer loop is loops[0] and the rest holes
 * (shared/frame/validate.ts): for figures that carry loop indices without the frame (cables, reactions).
 */
export const loopNameAt = (index: number): string => (index === 0 ? 'Outer' : `Hole ${index}`)

/** "Outer E2" for a cable figure { loop: 0, edge: 1 }. */
export const cableName = (c: { loop: number; edge: number }): string => edgeName(loopNameAt(c.loop), c.edge)
