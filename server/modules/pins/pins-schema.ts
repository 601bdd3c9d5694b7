import { z } from 'zod'
import { multiLineField } from '../../lib/text-fields.js'

const body = multiLineField(4000).min(1, 'required')
// z.number() refuses NaN and ±Infinity, so a pin always sits at a real point.
const coordinate = z
  .number('a finite number in metres')
  .min(-1e6, 'within ±1 000 000 m')
  .max(1e6, 'within ±1 000 000 m')

export const createPinBody = z.object({
  x: coordinate,
  y: coordinate,
  z: coordinate,
  docVersion: z.number().int('a whole number').min(0, 'not negative').max(4_294_967_295, 'too large'),
  body,
})

export const replyBody = z.object({ body })

export const patchPinBody = z
  .object({ body: body.optional(), resolved: z.boolean('true or false').optional() })
  .refine((p) => p.body !== undefined || p.resolved !== undefined, { message: 'give body or resolved' })

export const listPinsQuery = z.object({
  status: z.enum(['open', 'resolved', 'all'], { message: 'one of open, resolved, all' }).default('all'),
  mine: z.enum(['0', '1'], { message: '0 or 1' }).default('0'),
})

export type CreatePinBody = z.output<typeof createPinBody>
export type PatchPinBody = z.output<typeof patchPinBody>
export type ListPinsQuery = z.output<typeof listPinsQuery>
