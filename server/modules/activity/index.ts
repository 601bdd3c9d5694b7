/**
 * The rooms list's view of each room (issue 16): what changed last and who did it, open pins, the
 * settle state with a small picture, who is in the room now, with live `rooms:changed` updates.
 * Attached after the realtime layer: `attachActivity(...)` in server/main.ts.
 */
import type { Router } from 'express'
import type { DataSource } from 'typeorm'
import type { Realtime } from '../../realtime/index.js'
import { activityRepository } from './activity-repository.js'
import { createActivityRecorder, type ActivityRecorder } from './activity-recorder.js'
import { activityRoutes } from './activity-routes.js'
import type { RoomWrites } from './room-writes.js'
import { attachRoomsWatch } from './rooms-watch.js'

export { announceRoomWrites, roomWrites, type RoomWrites } from './room-writes.js'

export interface Activity {
  recorder: ActivityRecorder
  close(): Promise<void>
}

export function attachActivity(deps: {
  realtime: Realtime
  dataSource: DataSource
  api: Router
  writes: RoomWrites
  quietMs?: number
}): Activity {
  const { realtime, dataSource } = deps
  const repo = activityRepository(dataSource)
  const watch = attachRoomsWatch(realtime.io, dataSource)
  const recorder = createActivityRecorder({
    rooms: realtime.rooms,
    repo,
    changed: watch.changed,
    quietMs: deps.quietMs,
  })
  const unsubscribe = realtime.onRoomEvent(recorder.onRoomEvent)
  const onWrite = (roomId: string) => watch.changed(roomId)
  deps.writes.on('write', onWrite)
  deps.api.use(activityRoutes(dataSource, repo, watch))
  return {
    recorder,
    close: async () => {
      unsubscribe()
      deps.writes.off('write', onWrite)
      await recorder.close()
      watch.close()
    },
  }
}
