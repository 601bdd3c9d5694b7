import { z } from 'zod'

// Multipart fields arrive as text; z.coerce turns them into numbers, and refine keeps NaN out.
const num = (what: string) => z.coerce.number(`${what}: a number`).refine(Number.isFinite, `${what}: a finite number`)
const pixel = num('pixels').pipe(z.number().min(-100_000, 'within ±100000 px').max(100_000, 'within ±100000 px'))

export const underlayScale = z
  .object({
    ax: pixel,
    ay: pixel,
    bx: pixel,
    by: pixel,
    distance: num('metres').pipe(z.number().gt(0, 'greater than 0 m').max(100_000, 'at most 100000 m')),
    originX: pixel.default(0),
    originY: pixel.default(0),
  })
  .refine((s) => Math.hypot(s.bx - s.ax, s.by - s.ay) >= 1, {
    message: 'points A and B must be at least 1 pixel apart',
    path: ['bx'],
  })

// CSV files carry no prestress or element size; the form may send them.
const optionalNumber = z.preprocess((v) => (v === '' ? undefined : v), num('value').optional())
export const csvOptions = z.object({ warp: optionalNumber, fill: optionalNumber, edgeLength: optionalNumber })

export type UnderlayScale = z.output<typeof underlayScale>
