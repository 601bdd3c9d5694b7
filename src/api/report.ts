/**
 * What the printed report reads: a snapshot's or the room's current settled surface with its frame,
 * full figures and solver report (routes in server/modules/snapshots/snapshots-routes.ts).
 */
import { z } from 'zod'
import {
  figuresSchema,
  frameSchema,
  solverReportSchema,
  surfaceMeshJsonSchema,
  type Surface,
} from '../../shared/protocol'
import type { Frame } from '../../shared/types'
import { request } from './http'
import { roomPath } from './team'

const solved = z.object({ figures: figuresSchema, solver: solverReportSchema })
const meshAndSolved = <T extends z.ZodRawShape>(extra: T) => z.intersection(surfaceMeshJsonSchema, solved.extend(extra))

const replies = {
  snapshot: meshAndSolved({}),
  current: meshAndSolved({ frame: frameSchema }),
}

/** GET /api/rooms/:id/snapshots/:sid/surface: the snapshot's mesh, full figures and solver report. */
export async function getSnapshotResult(roomId: string, sid: string): Promise<Surface> {
  return request('GET', `${roomPath(roomId)}/snapshots/${encodeURIComponent(sid)}/surface`, undefined, replies.snapshot)
}

/** GET /api/rooms/:id/surface: the current settled state and the frame it was solved from; 409 while settling. */
export async function getCurrentResult(roomId: string): Promise<Surface & { frame: Frame }> {
  return request('GET', `${roomPath(roomId)}/surface`, undefined, replies.current)
}
