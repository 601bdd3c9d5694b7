import type { Request, RequestHandler } from 'express'
import type { DataSource } from 'typeorm'
import { can, type RoomAction } from '../../../shared/protocol/index.js'
import { MembershipEntity, type RoomRole } from '../../db/entities/index.js'
import { AppError, forbidden, signedOut } from '../../lib/app-error.js'

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i

export const roomNotFound = () => new AppError('room_not_found', 404, 'No such room, or you are not a member.')

/** The caller's role in the room, set by requireRoomAction. */
export function roomRole(req: Request): RoomRole {
  const role = req.roomRole
  if (!role) throw new Error('roomRole() used on a route without requireRoomAction()')
  return role
}

declare module 'express-serve-static-core' {
  interface Request {
    roomRole?: RoomRole
  }
}

/**
 * Guards a room route: signed out → 401 'signed_out'; not a member (or no such room) → 404
 * 'room_not_found', so outsiders cannot probe which rooms exist; a role that may not do `action`
 * (shared/protocol/roles.ts) → 403 'forbidden'. The room id is read from req.params[param].
 */
export function requireRoomAction(dataSource: DataSource, action: RoomAction, param = 'id'): RequestHandler {
  const memberships = dataSource.getRepository(MembershipEntity)
  return async (req, _res, next) => {
    if (!req.user) throw signedOut()
    const roomId = req.params[param]
    if (typeof roomId !== 'string' || !uuidPattern.test(roomId)) throw roomNotFound()
    // Normalised here, once, for every handler behind the guard: live sockets are keyed by the
    // lower-case id, so an upper-case URL must not reach closeRoomSockets or the services as typed.
    req.params[param] = roomId.toLowerCase()
    const membership = await memberships.findOneBy({ roomId: req.params[param], userId: req.user.id })
    if (!membership) throw roomNotFound()
    if (!can(membership.role, action)) throw forbidden()
    req.roomRole = membership.role
    next()
  }
}

/** 401 'signed_out' unless a user is signed in. */
export const requireUser: RequestHandler = (req, _res, next) => {
  if (!req.user) throw signedOut()
  next()
}
