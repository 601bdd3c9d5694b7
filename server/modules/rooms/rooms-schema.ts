import { z } from 'zod'
import { STARTERS, type StarterKey } from '../../../shared/room-doc/starters.js'
import { multiLineField, nameField } from '../../lib/text-fields.js'

const name = nameField(120)
const description = multiLineField(2000)

const starterKeys = STARTERS.map((s) => s.key) as [StarterKey, ...StarterKey[]]

export const createRoomBody = z.object({
  name,
  description: description.default(''),
  /** The starting frame written into the new room's document (shared/room-doc/starters.ts). */
  starter: z.enum(starterKeys, { error: `one of ${starterKeys.join(', ')}` }).default('blank'),
})

export const updateRoomBody = z
  .object({ name: name.optional(), description: description.optional() })
  .refine((b) => b.name !== undefined || b.description !== undefined, { message: 'give name or description' })

export type CreateRoomBody = z.output<typeof createRoomBody>
export type UpdateRoomBody = z.output<typeof updateRoomBody>
