import { Router } from 'express'
import type { DataSource } from 'typeorm'
import { RoomEntity } from '../../db/entities/index.js'
import { AppError } from '../../lib/app-error.js'
import { pinView } from '../pins/pins-service.js'
import { pinsRepository } from '../pins/pins-repository.js'
import { requireRoomAction } from '../rooms/room-access.js'
import type { LiveRoomPort } from '../../live-room-port/index.js'
import { roomIdOf, snapshotId } from '../snapshots/snapshots-routes.js'
import { surfaceResult, type SnapshotsService } from '../snapshots/snapshots-service.js'
import { renderDownload, sendDownload, type DownloadKind } from './downloads.js'
import { csvOptions, underlayScale } from './files-schema.js'
import { FRAME_FILE_BYTES, importFrame, UNDERLAY_BYTES, underlayService } from './files-service.js'
import { singleUpload } from './upload.js'

const noFile = (field: string) =>
  new AppError('invalid_upload', 400, `Attach the file in the form field "${field}".`, field)

/** Frame import, the underlay image, and downloads of the room's and snapshots' frame, surface and figures. */
export function filesRoutes(dataSource: DataSource, live: LiveRoomPort, snapshots: SnapshotsService): Router {
  const router = Router()
  const viewer = requireRoomAction(dataSource, 'read')
  const editor = requireRoomAction(dataSource, 'editFrame')
  const underlay = underlayService(dataSource)
  const frameUpload = singleUpload('file', FRAME_FILE_BYTES, 3)
  const imageUpload = singleUpload('image', UNDERLAY_BYTES, 7)
  const pinsRepo = pinsRepository(dataSource)
  /** Open pins, oldest first: the report and the figures CSV number them in this order. */
  const openPins = async (roomId: string) => (await pinsRepo.list(roomId, { resolved: false })).map(pinView)
  const roomName = async (roomId: string) =>
    (await dataSource.getRepository(RoomEntity).findOneBy({ id: roomId }))?.name ?? 'room'

  router.post('/rooms/:id/frame/import', editor, async (req, res) => {
    await frameUpload(req, res)
    if (!req.file) throw noFile('file')
    res.json({ frame: importFrame(req.file, csvOptions.parse(req.body ?? {})) })
  })

  router.put('/rooms/:id/underlay', editor, async (req, res) => {
    await imageUpload(req, res)
    if (!req.file) throw noFile('image')
    const scale = underlayScale.parse(req.body ?? {})
    res.json({ underlay: await underlay.put(roomIdOf(req.params.id), req.file.buffer, scale, req.user!.id) })
  })

  router.get('/rooms/:id/underlay', viewer, async (req, res) => {
    const u = await underlay.image(roomIdOf(req.params.id))
    res.type(u.mime).setHeader('Cache-Control', 'private, no-cache')
    res.setHeader('Last-Modified', u.updatedAt.toUTCString())
    res.send(u.image)
  })

  router.get('/rooms/:id/underlay/meta', viewer, async (req, res) => {
    res.json({ underlay: await underlay.meta(roomIdOf(req.params.id)) })
  })

  router.delete('/rooms/:id/underlay', editor, async (req, res) => {
    await underlay.remove(roomIdOf(req.params.id))
    res.status(204).end()
  })

  for (const kind of [
    'frame.json',
    'surface.obj',
    'surface.stl',
    'figures.csv',
  ] as const satisfies readonly DownloadKind[]) {
    router.get(`/rooms/:id/${kind}`, viewer, async (req, res) => {
      const roomId = roomIdOf(req.params.id)
      const name = await roomName(roomId)
      if (kind === 'frame.json') {
        const { frame, invalid } = await live.getRoomFrame(roomId)
        if (invalid)
          throw new AppError(
            'invalid_frame',
            409,
            `The room's frame is not valid (${invalid.message}): undo, import a frame or restore a snapshot to repair it.`,
            invalid.path,
          )
        if (!frame) throw new AppError('no_frame', 409, 'The room has no valid frame to download yet.')
        return sendDownload(res, kind, [name], renderDownload(kind, { title: name, frame }))
      }
      if (kind === 'figures.csv') {
        // The report's tables need the frame the surface was solved from, not a newer edit.
        const { frame, surface: s } = await snapshots.current(roomId)
        const data = { title: name, frame, surface: surfaceResult(s, s.figures), pins: await openPins(roomId) }
        return sendDownload(res, kind, [name], renderDownload(kind, data))
      }
      const s = await live.getLatestSurface(roomId)
      if (!s)
        throw new AppError(
          'no_surface',
          409,
          'There is no settled surface to download yet: wait until the solver reports "settled".',
        )
      sendDownload(res, kind, [name], renderDownload(kind, { title: name, surface: surfaceResult(s, s.figures) }))
    })

    router.get(`/rooms/:id/snapshots/:sid/${kind}`, viewer, async (req, res) => {
      const roomId = roomIdOf(req.params.id)
      const name = await roomName(roomId)
      const s = await snapshots.full(roomId, snapshotId(req.params.sid))
      const pins = kind === 'figures.csv' ? await openPins(roomId) : []
      const data = {
        title: `${name} — snapshot "${s.name}"`,
        frame: s.frame,
        surface: surfaceResult(s.surface, s.figures),
        pins,
      }
      sendDownload(res, kind, [name, s.name], renderDownload(kind, data))
    })
  }

  return router
}
