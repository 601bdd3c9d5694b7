import { z } from 'zod'

const name = z.string().trim().min(1, 'required').max(120, 'at most 120 characters')
const description = z.string().trim().max(2000, 'at most 2000 characters')

export const createRoomBody = z.object({ name, description: description.default('') })

export const updateRoomBody = z
  .object({ name: name.optional(), description: description.optional() })
  .refine((b) => b.name !== undefined || b.description !== undefined, { message: 'give name or description' })

export type CreateRoomBody = z.output<typeof createRoomBody>
export type UpdateRoomBody = z.output<typeof updateRoomBody>
