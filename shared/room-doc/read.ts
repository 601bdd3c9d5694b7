/**
 * Reading the room document back: the one place that checks its shape. A member can write any type
 * anywhere (a number where a loop's Y.Map was, a string for `loops`), and yjs accepts it, so every
 * reader — the server's solve loop, downloads, the seed, the client's frame view — goes through
 * here and gets either plain data or a named problem; nothing in this file throws.
 *
 * The expected layout is `FRAME_SHAPE` below (see schema.ts for what each part means). To add a
 * part to the document, add its key there; `shapeProblem` then checks it and the paths it reports
 * match the frame validator's (`loops[1].points[3]`), so one path names a bad place either way.
 */
import * as Y from 'yjs'
import { FrameError, parseFrameJson } from '../frame/index'
import type { Frame } from '../types'

/** Name of the root map that holds the frame. */
export const FRAME_KEY = 'frame'

/** What a part of the document must be: a Y.Map (with known keys checked), a Y.Array of one kind, or any value. */
export type Shape = { kind: 'map'; keys?: Record<string, Shape> } | { kind: 'array'; of: Shape } | { kind: 'value' }

const map = (keys?: Record<string, Shape>): Shape => ({ kind: 'map', keys })
const arrayOf = (of: Shape): Shape => ({ kind: 'array', of })

/** The frame map's layout. Keys may be absent (a new room, an older document); a present key must fit. */
export const FRAME_SHAPE: Record<string, Shape> = {
  prestress: map(),
  mesh: map(),
  loops: arrayOf(map({ points: arrayOf(map()) })),
}

/** A place in the document whose type is not the expected one. */
export interface ShapeProblem {
  /** Path in the frame file's terms, e.g. `loops[0].points[2]`. */
  path: string
  message: string
}

/** The outcome of reading the frame: empty (no loops yet), a valid frame, or why it is not one. */
export type FrameRead =
  { kind: 'empty' } | { kind: 'frame'; frame: Frame } | { kind: 'invalid'; path: string; message: string; code: string }

/** Names a value's type in plain words, for messages. */
export function describeValue(v: unknown): string {
  if (v instanceof Y.Map) return 'a map'
  if (v instanceof Y.Array) return 'a list'
  if (v instanceof Y.Text) return 'text'
  if (v instanceof Y.AbstractType) return 'another shared type'
  if (v === null) return 'null'
  if (Array.isArray(v)) return 'a plain list'
  if (v instanceof Uint8Array) return 'binary data'
  if (typeof v === 'object') return 'a plain object'
  return `a ${typeof v}`
}

const WANTED: Record<Shape['kind'], string> = { map: 'a map', array: 'a list', value: 'a value' }

function check(value: unknown, shape: Shape, path: string): ShapeProblem | null {
  if (shape.kind === 'value') return null
  if (shape.kind === 'array') {
    if (!(value instanceof Y.Array))
      return { path, message: `${path}: expected ${WANTED.array}, found ${describeValue(value)}` }
    const items = value.toArray() as unknown[]
    for (let i = 0; i < items.length; i++) {
      const problem = check(items[i], shape.of, `${path}[${i}]`)
      if (problem) return problem
    }
    return null
  }
  if (!(value instanceof Y.Map))
    return { path, message: `${path}: expected ${WANTED.map}, found ${describeValue(value)}` }
  return checkKeys(value, shape.keys ?? {}, path)
}

function checkKeys(m: Y.Map<unknown>, keys: Record<string, Shape>, path: string): ShapeProblem | null {
  for (const [key, shape] of Object.entries(keys)) {
    const v = m.get(key)
    if (v === undefined) continue
    const problem = check(v, shape, path ? `${path}.${key}` : key)
    if (problem) return problem
  }
  return null
}

/** The first place where the frame map departs from FRAME_SHAPE, or null when it fits. */
export function shapeProblem(doc: Y.Doc): ShapeProblem | null {
  try {
    return checkKeys(doc.getMap(FRAME_KEY), FRAME_SHAPE, '')
  } catch (err) {
    // getMap throws when the root name was taken by another type; any other surprise lands here too.
    return {
      path: FRAME_KEY,
      message: `${FRAME_KEY}: cannot be read (${err instanceof Error ? err.message : String(err)})`,
    }
  }
}

/** A scalar as stored; a shared type where a value belongs becomes its description (the validator then names the field). */
const scalar = (v: unknown): unknown => (v instanceof Y.AbstractType ? `[${describeValue(v)}]` : v)

/**
 * Reads the frame as plain data for the frame validator (shared/frame), every value as found so the
 * validator can name the bad field. Null for an empty document (no loops). Call only after
 * `shapeProblem` found nothing; `readRoomFrame` does both.
 */
function plainFrame(doc: Y.Doc): unknown {
  const root = doc.getMap(FRAME_KEY)
  const loops = root.get('loops') as Y.Array<Y.Map<unknown>> | undefined
  if (!loops || loops.length === 0) return null
  const prestress = root.get('prestress') as Y.Map<unknown> | undefined
  const mesh = root.get('mesh') as Y.Map<unknown> | undefined
  return {
    format: 'veilroom-frame',
    version: 1,
    units: 'm',
    // rooms made before the warp direction existed have none: the parser's default (0) applies
    prestress: {
      warp: scalar(prestress?.get('warp')),
      fill: scalar(prestress?.get('fill')),
      warpAngle: scalar(prestress?.get('warpAngle')),
    },
    mesh: { edgeLength: scalar(mesh?.get('edgeLength')) },
    loops: loops.toArray().map((loop) => {
      const points = ((loop.get('points') as Y.Array<Y.Map<unknown>> | undefined)?.toArray() ?? []) as Y.Map<unknown>[]
      return {
        role: scalar(loop.get('role')),
        points: points.map((p) => ({
          id: scalar(p.get('id')),
          x: scalar(p.get('x')),
          y: scalar(p.get('y')),
          z: scalar(p.get('z')),
        })),
        edges: points.map((p) => {
          const kind = scalar(p.get('edge'))
          return kind === 'cable' ? { kind, tension: scalar(p.get('tension')) } : { kind }
        }),
      }
    }),
  }
}

/**
 * The frame as plain data (null when empty), or `{ invalidShape }` naming the first misplaced type.
 * Never throws. For tests and tools that compare documents; the app reads through readRoomFrame.
 */
export function readRawFrame(doc: Y.Doc): unknown {
  const problem = shapeProblem(doc)
  return problem ? { invalidShape: problem } : plainFrame(doc)
}

/**
 * Reads and validates the room's frame. Never throws: a misplaced type or a bad value comes back as
 * `invalid` with the path (`loops[0].points[2]`, `prestress.warp`) and the reason.
 */
export function readRoomFrame(doc: Y.Doc): FrameRead {
  const problem = shapeProblem(doc)
  if (problem) return { kind: 'invalid', code: 'invalid-shape', ...problem }
  try {
    const raw = plainFrame(doc)
    if (raw === null) return { kind: 'empty' }
    return { kind: 'frame', frame: parseFrameJson(raw) }
  } catch (err) {
    if (err instanceof FrameError)
      return { kind: 'invalid', code: err.code, path: err.field ?? '', message: err.message }
    return {
      kind: 'invalid',
      code: 'invalid-field',
      path: FRAME_KEY,
      message: err instanceof Error ? err.message : String(err),
    }
  }
}

/** The Y.Map items of a Y.Array that should hold only maps (others are skipped: see shapeProblem). */
export function mapsIn(value: unknown): Y.Map<unknown>[] {
  return value instanceof Y.Array
    ? (value.toArray() as unknown[]).filter((v): v is Y.Map<unknown> => v instanceof Y.Map)
    : []
}

/** The loops Y.Array of the frame, or undefined when it is missing or not a Y.Array. */
export function loopsArray(doc: Y.Doc): Y.Array<unknown> | undefined {
  try {
    const loops = doc.getMap(FRAME_KEY).get('loops')
    return loops instanceof Y.Array ? loops : undefined
  } catch {
    return undefined
  }
}
