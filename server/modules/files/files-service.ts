import type { DataSource } from 'typeorm'
import { FrameError, parseFrameCsv, parseFrameJson } from '../../../shared/frame/index.js'
import type { Frame } from '../../../shared/types.js'
import { AppError, notFound } from '../../lib/app-error.js'
import { requireImage } from './image-check.js'
import type { UnderlayScale } from './files-schema.js'
import { underlayRepository } from './underlay-repository.js'

export const FRAME_FILE_BYTES = 1024 * 1024
export const UNDERLAY_BYTES = 4 * 1024 * 1024

const utf8 = new TextDecoder('utf-8', { fatal: true })
const invalidFrame = (message: string, field: string) => new AppError('invalid_frame', 400, message, field)

/** The uploaded bytes as text; a frame file must be UTF-8 (a leading BOM is allowed). */
function text(bytes: Buffer): string {
  try {
    return utf8.decode(bytes).replace(/^\uFEFF/, '')
  } catch {
    throw invalidFrame('The file is not UTF-8 text.', 'file')
  }
}

/**
 * Reads a .json or .csv frame file with the shared parser; a refusal names the place (field path,
 * or "line 7, column z" for CSV) and the reason. Returns the validated frame; the client writes it
 * into its document.
 */
export function importFrame(
  file: { originalname: string; buffer: Buffer },
  csv: { warp?: number; fill?: number; edgeLength?: number },
): Frame {
  const kind = /\.json$/i.test(file.originalname) ? 'json' : /\.csv$/i.test(file.originalname) ? 'csv' : null
  if (!kind) throw invalidFrame('Choose a .json frame file or a .csv file of loop,x,y,z[,edge,tension] rows.', 'file')
  try {
    if (kind === 'json') return parseFrameJson(text(file.buffer))
    const prestress =
      csv.warp !== undefined || csv.fill !== undefined
        ? { warp: csv.warp ?? csv.fill!, fill: csv.fill ?? csv.warp! }
        : undefined
    return parseFrameCsv(text(file.buffer), { prestress, edgeLength: csv.edgeLength })
  } catch (err) {
    if (err instanceof FrameError) throw invalidFrame(err.message, err.field)
    throw err
  }
}

export function underlayService(dataSource: DataSource) {
  const repo = underlayRepository(dataSource)
  const noUnderlay = () => notFound('no_underlay', 'This room has no underlay image.')

  const view = (u: NonNullable<Awaited<ReturnType<typeof repo.meta>>>) => ({
    mime: u.mime,
    width: u.width,
    height: u.height,
    ax: u.ax,
    ay: u.ay,
    bx: u.bx,
    by: u.by,
    distance: u.distance,
    originX: u.originX,
    originY: u.originY,
    metresPerPixel: u.distance / Math.hypot(u.bx - u.ax, u.by - u.ay),
    updatedAt: u.updatedAt.toISOString(),
  })

  return {
    async put(roomId: string, image: Buffer, scale: UnderlayScale, userId: string) {
      const info = requireImage(image, 'image')
      await repo.save({ roomId, image, ...info, ...scale, updatedById: userId })
      const saved = await repo.meta(roomId)
      return view(saved!)
    },
    /** The underlay's scale and size; null when the room has none (an empty value, not an error). */
    async meta(roomId: string) {
      const u = await repo.meta(roomId)
      return u ? view(u) : null
    },
    async image(roomId: string) {
      const u = await repo.image(roomId)
      if (!u) throw noUnderlay()
      return u
    },
    async remove(roomId: string) {
      if (!(await repo.delete(roomId)).affected) throw noUnderlay()
    },
  }
}
