import { Router } from 'express'
import type { DataSource } from 'typeorm'
import { AppError } from '../../lib/app-error.js'
import { requireRoomAction } from '../rooms/room-access.js'
import { createSnapshotBody } from './snapshots-schema.js'
import { surfaceResult, type SnapshotsService } from './snapshots-service.js'
import { CAUTION } from '../../../shared/protocol/index.js'

const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i
export const snapshotId = (raw: unknown): string => {
  if (typeof raw !== 'string' || !uuid.test(raw))
    throw new AppError('snapshot_not_found', 404, 'No such snapshot in this room.')
  return raw.toLowerCase()
}
export const roomIdOf = (raw: unknown): string => String(raw).toLowerCase()

/** /api/rooms/:id/snapshots — named copies of frame + surface + figures. */
export function snapshotsRoutes(dataSource: DataSource, snapshots: SnapshotsService): Router {
  const router = Router()
  const viewer = requireRoomAction(dataSource, 'read')
  const editor = requireRoomAction(dataSource, 'snapshot')

  router.get('/rooms/:id/snapshots', viewer, async (req, res) => {
    res.json({ snapshots: await snapshots.list(roomIdOf(req.params.id)) })
  })

  router.post('/rooms/:id/snapshots', editor, async (req, res) => {
    const body = createSnapshotBody.parse(req.body)
    res.status(201).json({ snapshot: await snapshots.create(roomIdOf(req.params.id), body, req.user!.id) })
  })

  // The current settled state, for a report marked unsaved: the frame with the surface solved from it.
  router.get('/rooms/:id/surface', viewer, async (req, res) => {
    const { frame, surface } = await snapshots.current(roomIdOf(req.params.id))
    res.json({ frame, ...surfaceResult(surface, surface.figures), caution: CAUTION })
  })

  router.get('/rooms/:id/snapshots/:sid', viewer, async (req, res) => {
    res.json({ snapshot: await snapshots.get(roomIdOf(req.params.id), snapshotId(req.params.sid)) })
  })

  router.get('/rooms/:id/snapshots/:sid/surface', viewer, async (req, res) => {
    const s = await snapshots.full(roomIdOf(req.params.id), snapshotId(req.params.sid))
    res.json({ ...surfaceResult(s.surface, s.figures), caution: CAUTION })
  })

  router.delete('/rooms/:id/snapshots/:sid', editor, async (req, res) => {
    await snapshots.remove(roomIdOf(req.params.id), snapshotId(req.params.sid))
    res.status(204).end()
  })

  return router
}
