import { Router } from 'express'
import type { DataSource } from 'typeorm'
import type { LiveRoomPort } from '../../live-room-port/index.js'
import { HOUR_MS, limiter } from '../../lib/rate-limits.js'
import { requireRoomAction, requireUser } from './room-access.js'
import { createRoomBody, updateRoomBody } from './rooms-schema.js'
import type { RoomsService } from './rooms-service.js'

/** /api/rooms: thin handlers; the service holds the rules, requireRoomAction the access. */
export function roomsRoutes(
  dataSource: DataSource,
  rooms: RoomsService,
  live: Pick<LiveRoomPort, 'ensureRoomFrame' | 'roomDeleted'> | undefined,
  limits: { roomsPerHour: number },
): Router {
  const router = Router()
  const viewer = requireRoomAction(dataSource, 'read')
  // Each room holds a document, a solve and its stored edits: a script must not make thousands.
  const roomLimiter = limiter({ what: 'new rooms', windowMs: HOUR_MS, limit: limits.roomsPerHour, key: 'user' })

  router.get('/', requireUser, async (req, res) => {
    res.json({ rooms: await rooms.list(req.user!.id) })
  })

  router.post('/', requireUser, roomLimiter, async (req, res) => {
    const body = createRoomBody.parse(req.body)
    const room = await rooms.create(body, req.user!.id)
    // Through the live room, so a document already loaded by it is never overwritten behind its back.
    await live?.ensureRoomFrame?.(room.id, body.starter)
    res.status(201).json({ room })
  })

  router.get('/:id', viewer, async (req, res) => {
    res.json({ room: await rooms.get(req.params.id as string, req.user!.id) })
  })

  router.patch('/:id', requireRoomAction(dataSource, 'rename'), async (req, res) => {
    const body = updateRoomBody.parse(req.body)
    res.json({ room: await rooms.update(req.params.id as string, body, req.user!.id) })
  })

  router.delete('/:id', requireRoomAction(dataSource, 'deleteRoom'), async (req, res) => {
    await rooms.remove(req.params.id as string)
    live?.roomDeleted(req.params.id as string)
    res.status(204).end()
  })

  router.get('/:id/members', viewer, async (req, res) => {
    res.json({ members: await rooms.members(req.params.id as string) })
  })

  return router
}
