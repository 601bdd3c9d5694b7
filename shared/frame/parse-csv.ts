/**
 * CSV frames: rows `loop,x,y,z[,edge,tension]`. loop 0 or "outer" is the outer loop, other
 * integers are holes in order of first appearance. An optional header row, blank lines and lines
 * starting with # are skipped. edge is "rigid" (default when empty) or "cable" with a tension in kN.
 * Errors name the place as `line 7, column z`.
 */
import type { Frame } from '../types'
import { FrameError } from './frame-error'
import { parseFrameJson } from './parse-json'
import type { FrameFile } from './schema'

const COLUMNS = ['loop', 'x', 'y', 'z', 'edge', 'tension'] as const

export interface CsvFrameOptions {
  prestress?: { warp: number; fill: number; warpAngle?: number }
  edgeLength?: number
}

/** Parse and validate a CSV frame; prestress and edge length come from options or defaults. */
export function parseFrameCsv(text: string, options: CsvFrameOptions = {}): Frame {
  const loops = new Map<string, { lines: number[]; loop: FrameFile['loops'][number] }>()
  const lines = text.split(/\r?\n/)
  lines.forEach((raw, index) => {
    const line = raw.trim()
    const lineNo = index + 1
    if (line === '' || line.startsWith('#')) return
    const cells = line.split(',').map((c) => c.trim())
    if (index === firstDataLine(lines) && cells[0]?.toLowerCase() === 'loop') return
    if (cells.length < 4 || cells.length > 6) {
      throw new FrameError(
        'csv-syntax',
        `has ${cells.length} columns; expected loop,x,y,z[,edge,tension]`,
        `line ${lineNo}`,
      )
    }
    const where = (c: number): string => `line ${lineNo}, column ${COLUMNS[c]}`
    const num = (c: number): number => {
      const s = cells[c] ?? ''
      const v = Number(s)
      if (s === '' || Number.isNaN(v)) throw new FrameError('invalid-field', `"${s}" is not a number`, where(c))
      if (!Number.isFinite(v)) throw new FrameError('not-finite', `must be a finite number (got ${s})`, where(c))
      return v
    }
    const label = cells[0]!.toLowerCase() === 'outer' ? '0' : cells[0]!
    if (!/^\d+$/.test(label))
      throw new FrameError('csv-syntax', `loop "${cells[0]}" must be "outer" or a whole number`, where(0))
    const kind = (cells[4] ?? '').toLowerCase() || 'rigid'
    if (kind !== 'rigid' && kind !== 'cable') {
      throw new FrameError('unknown-edge-kind', `unknown edge kind "${cells[4]}"; use rigid or cable`, where(4))
    }
    const key = String(Number(label))
    let entry = loops.get(key)
    if (!entry) {
      entry = { lines: [], loop: { role: key === '0' ? 'outer' : 'hole', points: [], edges: [] } }
      loops.set(key, entry)
    }
    entry.lines.push(lineNo)
    entry.loop.points.push({ x: num(1), y: num(2), z: num(3) })
    entry.loop.edges!.push(kind === 'cable' && (cells[5] ?? '') !== '' ? { kind, tension: num(5) } : { kind })
  })
  const ordered = [...loops.entries()].sort(([a], [b]) => (a === '0' ? -1 : b === '0' ? 1 : 0))
  const file: FrameFile = { loops: ordered.map(([, e]) => e.loop) }
  if (options.prestress) file.prestress = options.prestress
  if (options.edgeLength !== undefined) file.mesh = { edgeLength: options.edgeLength }
  try {
    return parseFrameJson(file)
  } catch (err) {
    throw err instanceof FrameError
      ? toCsvPlace(
          err,
          ordered.map(([, e]) => e.lines),
        )
      : err
  }
}

function firstDataLine(lines: readonly string[]): number {
  return lines.findIndex((l) => l.trim() !== '' && !l.trim().startsWith('#'))
}

/** `loops[1].points[3].x` → `line 9, column x` using the line numbers of each loop's rows. */
function toCsvPlace(err: FrameError, lineOf: readonly number[][]): FrameError {
  const m = /^loops\[(\d+)\]\.(points|edges)\[(\d+)\](?:\.(\w+))?/.exec(err.field)
  if (!m) {
    const loop = /^loops\[(\d+)\]/.exec(err.field)
    const first = loop ? lineOf[Number(loop[1])]?.[0] : undefined
    return first === undefined ? err : new FrameError(err.code, `the loop starting here ${err.reason}`, `line ${first}`)
  }
  const line = lineOf[Number(m[1])]?.[Number(m[3])]
  if (line === undefined) return err
  const column = m[2] === 'edges' ? (m[4] === 'tension' ? 'tension' : 'edge') : (m[4] ?? 'x')
  return new FrameError(err.code, err.reason, `line ${line}, column ${column}`)
}
