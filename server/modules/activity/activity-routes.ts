import { Router } from 'express'
import type { DataSource } from 'typeorm'
import { notFound } from '../../lib/app-error.js'
import { requireRoomAction, requireUser } from '../rooms/room-access.js'
import type { ActivityRepository, RoomActivityRow } from './activity-repository.js'
import type { RoomsWatch } from './rooms-watch.js'

/** What the rooms list shows beside each room (the shape of GET /api/activity/rooms). */
function view(roomId: string, row: RoomActivityRow, people: number) {
  return {
    lastChange: row.lastChange && {
      at: row.lastChange.at.toISOString(),
      by: row.lastChange.by,
      what: row.lastChange.what,
    },
    openPins: row.openPins,
    myOpenPins: row.myOpenPins,
    solve: row.solveState && { state: row.solveState, reason: row.solveReason },
    people,
    // the time in the address makes a new picture a new URL, so browsers may cache each one
    thumbnail: row.thumbnailAt ? `/api/activity/rooms/${roomId}/thumbnail.png?t=${row.thumbnailAt.getTime()}` : null,
  }
}

/** /api/activity: per-room activity for the rooms list, and each room's small picture. */
export function activityRoutes(ds: DataSource, repo: ActivityRepository, watch: RoomsWatch): Router {
  const router = Router()
  const read = requireRoomAction(ds, 'read')

  const views = async (roomIds: string[], userId: string) => {
    const [rows, people] = await Promise.all([repo.forRooms(roomIds, userId), watch.peopleIn(roomIds)])
    return Object.fromEntries(roomIds.map((id) => [id, view(id, rows.get(id)!, people.get(id) ?? 0)]))
  }

  router.get('/activity/rooms', requireUser, async (req, res) => {
    const mine: { room_id: string }[] = await ds.query('SELECT room_id FROM memberships WHERE user_id = ?', [
      req.user!.id,
    ])
    res.json({
      rooms: await views(
        mine.map((m) => m.room_id),
        req.user!.id,
      ),
    })
  })

  router.get('/activity/rooms/:id', read, async (req, res) => {
    const id = req.params.id as string
    res.json({ activity: (await views([id], req.user!.id))[id] })
  })

  router.get('/activity/rooms/:id/thumbnail.png', read, async (req, res) => {
    const png = await repo.thumbnail(req.params.id as string)
    if (!png) throw notFound('no_thumbnail', 'This room has no settled surface to show yet.')
    res.type('image/png').set('Cache-Control', 'private, max-age=86400').send(png)
  })

  return router
}
