import { z } from 'zod'
import { roomRoles } from '../../db/entities/index.js'

const email = z
  .email('not a valid e-mail address')
  .max(254, 'at most 254 characters')
  .transform((s) => s.trim().toLowerCase())
const role = z.enum(roomRoles, { message: `one of ${roomRoles.join(', ')}` })

export const createInviteBody = z.object({ email, role })
export const memberRoleBody = z.object({ role })

// Tokens are 32 random bytes in base64url: exactly 43 characters of [A-Za-z0-9_-].
export const inviteToken = z.string().regex(/^[A-Za-z0-9_-]{43}$/)
export const uuidParam = z.uuid()

export type CreateInviteBody = z.output<typeof createInviteBody>
