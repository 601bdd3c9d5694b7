import { Router } from 'express'
import type { DataSource } from 'typeorm'
import { AppError } from '../../lib/app-error.js'
import { requireRoomAction, roomRole } from '../rooms/room-access.js'
import { createPinBody, listPinsQuery, patchPinBody, replyBody } from './pins-schema.js'
import type { pinsService } from './pins-service.js'

const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i
const pinId = (raw: unknown): string => {
  if (typeof raw !== 'string' || !uuid.test(raw)) throw new AppError('pin_not_found', 404, 'No such pin in this room.')
  return raw.toLowerCase()
}

/** /api/rooms/:id/pins — review comments anchored to points of the surface. */
export function pinsRoutes(dataSource: DataSource, pins: ReturnType<typeof pinsService>): Router {
  const router = Router()
  const viewer = requireRoomAction(dataSource, 'read')
  const reviewer = requireRoomAction(dataSource, 'pin')

  router.get('/rooms/:id/pins', viewer, async (req, res) => {
    const q = listPinsQuery.parse(req.query)
    res.json({ pins: await pins.list(req.params.id as string, q, req.user!.id) })
  })

  router.post('/rooms/:id/pins', reviewer, async (req, res) => {
    const body = createPinBody.parse(req.body)
    res.status(201).json({ pin: await pins.create(req.params.id as string, body, req.user!.id) })
  })

  router.post('/rooms/:id/pins/:pinId/replies', reviewer, async (req, res) => {
    const { body } = replyBody.parse(req.body)
    res
      .status(201)
      .json({ pin: await pins.reply(req.params.id as string, pinId(req.params.pinId), body, req.user!.id) })
  })

  router.patch('/rooms/:id/pins/:pinId', reviewer, async (req, res) => {
    const patch = patchPinBody.parse(req.body)
    const actor = { id: req.user!.id, role: roomRole(req) }
    res.json({ pin: await pins.patch(req.params.id as string, pinId(req.params.pinId), patch, actor) })
  })

  router.delete('/rooms/:id/pins/:pinId', reviewer, async (req, res) => {
    await pins.remove(req.params.id as string, pinId(req.params.pinId), req.user!.id)
    res.status(204).end()
  })

  return router
}
