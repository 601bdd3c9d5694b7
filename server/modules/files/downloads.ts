import type { Response } from 'express'
import { figuresToCsv, toObj, toStl } from '../../../shared/export/index.js'
import { frameToJson } from '../../../shared/frame/index.js'
import type { ReportPin } from '../../../shared/report/index.js'
import type { Frame, SurfaceResult } from '../../../shared/types.js'
import { CAUTION } from '../../../shared/protocol/index.js'
import { oneLine } from '../../lib/text-fields.js'

export type DownloadKind = 'frame.json' | 'surface.obj' | 'surface.stl' | 'figures.csv'
export const downloadKinds: readonly DownloadKind[] = ['frame.json', 'surface.obj', 'surface.stl', 'figures.csv']

/**
 * A file name from free text: accents dropped, anything outside [A-Za-z0-9._-] turned into "-",
 * at most 80 characters, never empty, so it is safe in a Content-Disposition header and on disk.
 */
export function safeFileName(...parts: string[]): string {
  const slug = parts
    .join(' ')
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^A-Za-z0-9._-]+/g, '-')
    .replace(/^[-.]+|[-.]+$/g, '')
    .replace(/-{2,}/g, '-')
    .slice(0, 80)
    .replace(/[-.]+$/, '')
  return slug || 'veilroom-room'
}

/** The frame file (re-imports unchanged: the parser ignores the extra `caution` field). */
export function frameDownload(frame: Readonly<Frame>): string {
  const file = JSON.parse(frameToJson(frame)) as Record<string, unknown>
  return JSON.stringify({ ...file, caution: CAUTION }, null, 2) + '\n'
}

/** What a download is made from; figures.csv needs the frame, the surface and the open pins. */
export interface DownloadData {
  title: string
  frame?: Frame
  surface?: SurfaceResult
  pins?: ReportPin[]
}

/** The body and content type of one download; OBJ, STL and CSV carry the caution (shared/export). */
export function renderDownload(kind: DownloadKind, data: DownloadData): { body: string; type: string } {
  // A room named before names were checked may still hold a line break: keep the header one line.
  const header = `# Veilroom — ${oneLine(data.title)} — exported ${new Date().toISOString()}\n`
  switch (kind) {
    case 'frame.json':
      return { body: frameDownload(data.frame!), type: 'application/json; charset=utf-8' }
    case 'surface.obj':
      return { body: header + toObj(data.surface!), type: 'text/plain; charset=utf-8' }
    case 'surface.stl':
      return { body: toStl(data.surface!), type: 'model/stl' }
    case 'figures.csv':
      return {
        body:
          header +
          figuresToCsv(
            { frame: data.frame!, figures: data.surface!.figures, solver: data.surface!.solver, pins: data.pins ?? [] },
            CAUTION,
          ),
        type: 'text/csv; charset=utf-8',
      }
  }
}

/** Sends the file as an attachment named after the room (and snapshot), sanitised. */
export function sendDownload(
  res: Response,
  kind: DownloadKind,
  names: string[],
  file: { body: string; type: string },
): void {
  const [base, ext] = kind.split('.') as [string, string]
  res.attachment(`${safeFileName(...names, base)}.${ext}`)
  res.type(file.type)
  res.setHeader('Cache-Control', 'private, no-store')
  res.send(file.body)
}
