import type { PatternResult } from '../../../shared/pattern/index.js'
import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import type { Figures, Frame, SurfaceResult } from '../../../shared/types.js'
import type { Snapshot, User } from '../../db/entities/index.js'
import { AppError, notFound } from '../../lib/app-error.js'
import type { SettledSurface } from '../../../shared/protocol/index.js'
import type { LiveRoomPort } from '../../live-room-port/index.js'
import type { CreateSnapshotBody } from './snapshots-schema.js'
import { snapshotsRepository } from './snapshots-repository.js'
import { decodeSurface, encodeSurface, type StoredSurface } from './surface-codec.js'

/** The figures a snapshot list shows (the full set is in the snapshot itself). */
export function figuresSummary(f: Figures) {
  return {
    area: f.area,
    planArea: f.planArea,
    perimeter: f.perimeter,
    heightRange: f.heightRange,
    slopeRange: f.slopeRange,
    flatShare: f.flatShare,
    cableCount: f.cables.length,
  }
}

const person = (u: User | null | undefined) => (u ? { id: u.id, name: u.name } : null)
const snapshotNotFound = () =>
  notFound('snapshot_not_found', 'No such snapshot in this room (it may have been deleted).')

function head(s: Snapshot) {
  return { id: s.id, name: s.name, note: s.note, author: person(s.author), createdAt: s.createdAt.toISOString() }
}

/** Float32 values printed with the digits float32 holds, not the noise of widening to float64. */
const f32 = (v: number) => Number(v.toPrecision(7))

/** PRODUCT.md "Surface result" JSON from stored arrays. */
export function surfaceResult(s: StoredSurface, figures: Figures): SurfaceResult {
  const vertices: [number, number, number][] = []
  for (let i = 0; i < s.vertices.length; i += 3)
    vertices.push([f32(s.vertices[i]!), f32(s.vertices[i + 1]!), f32(s.vertices[i + 2]!)])
  const triangles: [number, number, number][] = []
  for (let i = 0; i < s.triangles.length; i += 3)
    triangles.push([s.triangles[i]!, s.triangles[i + 1]!, s.triangles[i + 2]!])
  return { vertices, triangles, figures, solver: s.solver }
}

export function snapshotsService(
  dataSource: DataSource,
  live: Pick<LiveRoomPort, 'getRoomFrame' | 'getLatestSurface'>,
) {
  const repo = snapshotsRepository(dataSource)

  async function load(roomId: string, id: string, withSurface = false): Promise<Snapshot> {
    const s = await repo.find(roomId, id, withSurface)
    if (!s) throw snapshotNotFound()
    return s
  }

  /** The room's frame with the settled surface solved from it; 409 while there is none or it lags an edit. */
  async function current(roomId: string): Promise<{ frame: Frame; surface: SettledSurface }> {
    const { frame, version, invalid } = await live.getRoomFrame(roomId)
    if (invalid)
      throw new AppError(
        'invalid_frame',
        409,
        `The room's frame is not valid (${invalid.message}): undo, import a frame or restore a snapshot to repair it.`,
        invalid.path,
      )
    if (!frame) throw new AppError('no_frame', 409, 'The room has no valid frame yet.')
    const surface = await live.getLatestSurface(roomId)
    if (!surface || !surface.solver.converged) {
      throw new AppError('no_surface', 409, 'There is no settled surface yet: wait until the solver reports "settled".')
    }
    if (surface.version !== version) {
      throw new AppError(
        'no_surface',
        409,
        'The surface is still settling after the latest edit: try again once it is settled.',
      )
    }
    return { frame, surface }
  }

  return {
    current,

    async list(roomId: string) {
      const rows = await repo.list(roomId)
      return rows.map((s) => ({ ...head(s), figures: figuresSummary(s.figures as Figures) }))
    },

    /** Saves the current frame with its settled surface; 409 when the surface does not match it yet. */
    async create(roomId: string, input: CreateSnapshotBody, authorId: string) {
      const { frame, surface } = await current(roomId)
      const id = randomUUID()
      const blob = encodeSurface({ vertices: surface.vertices, triangles: surface.triangles, solver: surface.solver })
      await repo.insert({
        id,
        roomId,
        name: input.name,
        note: input.note,
        authorId,
        frame,
        surface: blob,
        figures: surface.figures,
        pattern: surface.pattern ?? null,
      })
      const saved = await load(roomId, id)
      return { ...head(saved), figures: figuresSummary(surface.figures) }
    },

    async get(roomId: string, id: string) {
      const s = await load(roomId, id)
      return {
        ...head(s),
        frame: s.frame as Frame,
        figures: s.figures as Figures,
        pattern: (s.pattern ?? null) as PatternResult | null,
      }
    },

    /** Everything needed for downloads: name, frame, figures and the decoded surface. */
    async full(roomId: string, id: string) {
      const s = await load(roomId, id, true)
      return { name: s.name, frame: s.frame as Frame, figures: s.figures as Figures, surface: decodeSurface(s.surface) }
    },

    async remove(roomId: string, id: string): Promise<void> {
      const result = await repo.delete(roomId, id)
      if (!result.affected) throw snapshotNotFound()
    },
  }
}

export type SnapshotsService = ReturnType<typeof snapshotsService>
