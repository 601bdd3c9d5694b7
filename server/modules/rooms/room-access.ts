import type { Request, RequestHandler } from 'express'
import type { DataSource } from 'typeorm'
import { MembershipEntity, type RoomRole } from '../../db/entities/index.js'
import { AppError, forbidden, signedOut } from '../../lib/app-error.js'

const rank: Record<RoomRole, number> = { owner: 4, editor: 3, reviewer: 2, viewer: 1 }

/** True when `role` carries at least the rights of `min` (owner ⊃ editor ⊃ reviewer ⊃ viewer). */
export const roleAtLeast = (role: RoomRole, min: RoomRole): boolean => rank[role] >= rank[min]

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i

export const roomNotFound = () => new AppError('room_not_found', 404, 'No such room, or you are not a member.')

/** The caller's role in the room, set by requireRoomRole. */
export function roomRole(req: Request): RoomRole {
  const role = req.roomRole
  if (!role) throw new Error('roomRole() used on a route without requireRoomRole()')
  return role
}

declare module 'express-serve-static-core' {
  interface Request {
    roomRole?: RoomRole
  }
}

/**
 * Guards a room route: signed out → 401 'signed_out'; not a member (or no such room) → 404
 * 'room_not_found', so outsiders cannot probe which rooms exist; role too low → 403 'forbidden'.
 * The room id is read from req.params[param].
 */
export function requireRoomRole(dataSource: DataSource, min: RoomRole, param = 'id'): RequestHandler {
  const memberships = dataSource.getRepository(MembershipEntity)
  return async (req, _res, next) => {
    if (!req.user) throw signedOut()
    const roomId = req.params[param]
    if (typeof roomId !== 'string' || !uuidPattern.test(roomId)) throw roomNotFound()
    const membership = await memberships.findOneBy({ roomId: roomId.toLowerCase(), userId: req.user.id })
    if (!membership) throw roomNotFound()
    if (!roleAtLeast(membership.role, min)) throw forbidden()
    req.roomRole = membership.role
    next()
  }
}

/** 401 'signed_out' unless a user is signed in. */
export const requireUser: RequestHandler = (req, _res, next) => {
  if (!req.user) throw signedOut()
  next()
}
