/**
 * The room document read back as plain data for the workbench: loops and points keep their ids
 * (edits address them by id) and every value is passed on as found, a non-number becoming NaN, so
 * the table can show a bad value instead of hiding it. Values are not validated here (the server's
 * frame validator names bad fields through the solver status); the document's shape is, through
 * shared/room-doc/read.ts: a misplaced type is skipped and reported as `problem`, never thrown.
 */
import * as Y from 'yjs'
import type { EdgeKind } from '../../shared/types'
import { mapsIn, shapeProblem, type ShapeProblem } from '../../shared/room-doc/read'
import { frameMap } from '../../shared/room-doc/schema'
import { loopNames, pointLabel, pointName } from '../../shared/report/numbering'

export interface ViewPoint {
  id: string
  /** Plan position and height, metres. */
  x: number
  y: number
  z: number
  /** The edge that starts at this point. */
  edge: EdgeKind
  /** Cable tension in kN, for cable edges. */
  tension: number | undefined
}

export interface ViewLoop {
  id: string
  role: 'outer' | 'hole'
  points: ViewPoint[]
}

export interface FrameView {
  loops: ViewLoop[]
  /** Membrane prestress, kN/m; warpAngle: warp direction in plan, degrees from +x. */
  prestress: { warp: number; fill: number; warpAngle: number }
  /** Target element size, m. */
  edgeLength: number
  /** The first part of the document that is not of the expected type (its parts are left out above). */
  problem: ShapeProblem | null
}

const num = (v: unknown): number => (typeof v === 'number' ? v : Number.NaN)
const angle = (v: unknown): number => (v === undefined ? 0 : num(v))
const str = (v: unknown): string => (typeof v === 'string' ? v : '')

/** Reads the frame of a room document; an empty document gives no loops. */
export function readFrameView(doc: Y.Doc): FrameView {
  const problem = shapeProblem(doc)
  if (problem?.path === 'frame')
    return {
      loops: [],
      prestress: { warp: Number.NaN, fill: Number.NaN, warpAngle: Number.NaN },
      edgeLength: Number.NaN,
      problem,
    }
  const root = frameMap(doc)
  const prestress = root.get('prestress')
  const mesh = root.get('mesh')
  const loops = root.get('loops')
  return {
    problem,
    prestress: {
      warp: prestress instanceof Y.Map ? num(prestress.get('warp')) : Number.NaN,
      fill: prestress instanceof Y.Map ? num(prestress.get('fill')) : Number.NaN,
      // rooms made before the warp direction existed have none, which the solver reads as 0
      warpAngle: prestress instanceof Y.Map ? angle(prestress.get('warpAngle')) : Number.NaN,
    },
    edgeLength: mesh instanceof Y.Map ? num(mesh.get('edgeLength')) : Number.NaN,
    loops: mapsIn(loops).map(readLoop),
  }
}

function readLoop(loop: Y.Map<unknown>): ViewLoop {
  const points = mapsIn(loop.get('points'))
  return {
    id: str(loop.get('id')),
    role: loop.get('role') === 'hole' ? 'hole' : 'outer',
    points: points.map((p) => {
      const tension = p.get('tension')
      return {
        id: str(p.get('id')),
        x: num(p.get('x')),
        y: num(p.get('y')),
        z: num(p.get('z')),
        edge: p.get('edge') === 'cable' ? 'cable' : 'rigid',
        tension: typeof tension === 'number' ? tension : undefined,
      }
    }),
  }
}

/** One row of the points table. */
export interface PointRow extends ViewPoint {
  /** Unique across the frame: loop id and point id. */
  key: string
  loopId: string
  /** "Outer" or "Hole 1", "Hole 2", … in document order (shared/report/numbering.ts). */
  loopLabel: string
  /** "P1", "P2", … within the loop, in loop order. */
  label: string
  /** "Outer P3": loop and point, as the report and the figures name it. */
  name: string
}

/** Flattens a frame into table rows: the outer loop first, then the holes, each in loop order. */
export function frameRows(view: Readonly<FrameView>): PointRow[] {
  const names = loopNames(view.loops)
  const named = view.loops.map((loop, l) => ({ loop, loopLabel: names[l]! }))
  const ordered = [...named.filter((n) => n.loop.role === 'outer'), ...named.filter((n) => n.loop.role === 'hole')]
  return ordered.flatMap(({ loop, loopLabel }) =>
    loop.points.map((p, i) => ({
      ...p,
      key: `${loop.id}/${p.id}`,
      loopId: loop.id,
      loopLabel,
      label: pointLabel(i),
      name: pointName(loopLabel, i),
    })),
  )
}

/** Finds a point of the view by ids. */
export function viewPoint(view: Readonly<FrameView>, loopId: string, pointId: string): ViewPoint | undefined {
  return view.loops.find((l) => l.id === loopId)?.points.find((p) => p.id === pointId)
}
