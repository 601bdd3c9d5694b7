import { z } from 'zod'
import { roomRoleSchema } from '../../shared/protocol'

/**
 * Shapes of the server's JSON replies (the API contract of issue 2). Replies are checked at the edge
 * so a contract drift shows up as one clear ApiError instead of `undefined` deep inside a view.
 * Ids are strings on the client whatever the server stores (UUID or integer).
 */
const id = z.union([z.string().min(1), z.number().int()]).transform(String)

export { roomRoles, type RoomRole } from '../../shared/protocol'
const roomRole = roomRoleSchema

export const user = z.object({ id, email: z.string(), name: z.string() })
export type User = z.infer<typeof user>

export const roomSummary = z.object({
  id,
  name: z.string(),
  description: z
    .string()
    .nullable()
    .transform((d) => d ?? ''),
  role: roomRole,
  memberCount: z.number().int().nonnegative(),
  updatedAt: z.string(),
})
export type RoomSummary = z.infer<typeof roomSummary>

export const roomDetail = roomSummary.extend({ createdAt: z.string() })
export type RoomDetail = z.infer<typeof roomDetail>

export const member = z.object({ userId: id, name: z.string(), email: z.string(), role: roomRole })
export type Member = z.infer<typeof member>

export const errorBody = z.object({
  error: z.object({ code: z.string(), message: z.string(), field: z.string().optional() }),
})

export const replies = {
  health: z.object({ ok: z.boolean(), db: z.string() }),
  csrf: z.object({ token: z.string().min(1) }),
  me: z.object({ user: user.nullable() }),
  user: z.object({ user }),
  rooms: z.object({ rooms: z.array(roomSummary) }),
  room: z.object({ room: roomDetail }),
  members: z.object({ members: z.array(member) }),
}
