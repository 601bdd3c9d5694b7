/**
 * The room's seams as families (what people edit), turned into the cuts the pattern reads:
 * - parallel: vertical planes whose normal points `angle`° from +x in plan, every `spacing` m,
 *   through the plan point `offset`·normal (0 = through the origin), across the whole surface;
 * - radial: `count` vertical planes through the plan point (x, y) (a mast), `startAngle`° and then
 *   evenly over 180° — each plane cuts both sides of the point, so 2·count strips round it;
 * - geodesic: the shortest line on the surface between two points picked on it or on the frame.
 * A room with a radial family gets its warp radial from that family's centre (tents).
 */
import { z } from 'zod'
import { cutSettingsSchema, MAX_SEAMS } from './schema'
import type { CutSettings, Seam } from './types'

const finite = z.number()
const id = z.string().min(1).max(64)

export const seamFamilySchema = z.discriminatedUnion('kind', [
  z.object({
    id,
    kind: z.literal('parallel'),
    angle: finite.min(-360).max(360),
    spacing: finite.min(0.05).max(100),
    offset: finite.min(-1e4).max(1e4),
  }),
  z.object({
    id,
    kind: z.literal('radial'),
    x: finite,
    y: finite,
    count: z.int().min(1).max(90),
    startAngle: finite.min(-360).max(360),
  }),
  z.object({
    id,
    kind: z.literal('geodesic'),
    from: z.tuple([finite, finite, finite]),
    to: z.tuple([finite, finite, finite]),
  }),
])
export type SeamFamily = z.infer<typeof seamFamilySchema>

/** The room's cut settings and seam families (the document's 'pattern' map, checked). */
export const roomCutsSchema = z.object({
  settings: cutSettingsSchema.omit({ seams: true, warpCentre: true }),
  families: z.array(seamFamilySchema).max(MAX_SEAMS),
})
export type RoomCuts = z.infer<typeof roomCutsSchema>

/** Range of n·(x, y) over the vertices (#V×3), for placing parallel planes across the surface. */
function planRange(vertices: Readonly<ArrayLike<number>>, nx: number, ny: number): [number, number] {
  let lo = Infinity,
    hi = -Infinity
  for (let v = 0; v < vertices.length; v += 3) {
    const d = nx * vertices[v]! + ny * vertices[v + 1]!
    lo = Math.min(lo, d)
    hi = Math.max(hi, d)
  }
  return [lo, hi]
}

/**
 * The cuts for a surface (vertices #V×3, m): families expanded to planes strictly inside the
 * surface's plan extent (at most MAX_SEAMS in all; the rest are dropped and counted), and for
 * each seam the index of its family.
 */
export function cutsForSurface(
  cuts: Readonly<RoomCuts>,
  vertices: Readonly<ArrayLike<number>>,
): { settings: CutSettings; dropped: number; familyOfSeam: number[] } {
  const seams: Seam[] = []
  const familyOfSeam: number[] = []
  let dropped = 0
  let family = 0
  const add = (s: Seam) => {
    if (seams.length >= MAX_SEAMS) return dropped++
    familyOfSeam.push(family)
    return seams.push(s)
  }
  let warpCentre: [number, number] | undefined
  for (const [index, f] of cuts.families.entries()) {
    family = index
    if (f.kind === 'parallel') {
      const a = (f.angle * Math.PI) / 180
      const nx = Math.cos(a),
        ny = Math.sin(a)
      const [lo, hi] = planRange(vertices, nx, ny)
      const first = f.offset + Math.ceil((lo - f.offset) / f.spacing) * f.spacing
      for (let d = first; d < hi; d += f.spacing)
        if (d > lo) add({ kind: 'plane', point: [d * nx, d * ny, 0], normal: [nx, ny, 0] })
    } else if (f.kind === 'radial') {
      warpCentre ??= [f.x, f.y]
      for (let k = 0; k < f.count; k++) {
        const a = ((f.startAngle + (180 * k) / f.count) * Math.PI) / 180
        add({ kind: 'plane', point: [f.x, f.y, 0], normal: [-Math.sin(a), Math.cos(a), 0] })
      }
    } else add({ kind: 'geodesic', from: f.from, to: f.to })
  }
  return { settings: { ...cuts.settings, warpCentre, seams }, dropped, familyOfSeam }
}
