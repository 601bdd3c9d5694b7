/**
 * The report's tables from a frame, its solved figures, the solver's report and the open pins:
 * inputs, frame points, frame edges, forces at frame points, figures, ponding pockets, pins.
 * Units: m, kN, kN/m, degrees. Numbering: numbering.ts (1-based, loop name + P/E number).
 */
import { reasonWords } from '../protocol/solver-reasons'
import type { Figures, FrameLoop, SolverReport } from '../types'
import { edgeName, loopNames, pointLabel, pointName } from './numbering'
import type { ReportTable } from './table'

/** The frame fields the report reads; warpAngle is shown when the frame carries one. */
export interface ReportFrame {
  prestress: { warp: number; fill: number; warpAngle?: number }
  mesh: { edgeLength: number }
  loops: readonly FrameLoop[]
}

/** A review pin as the API gives it (open pins only are reported). */
export interface ReportPin {
  x: number
  y: number
  z: number
  body: string
  author: { name: string } | null
  createdAt: string
  replies: readonly { body: string; author: { name: string } | null; createdAt: string }[]
}

export interface ReportInput {
  frame: ReportFrame
  figures: Figures
  solver: SolverReport
  /** Open pins in the order they are numbered (oldest first). */
  pins: readonly ReportPin[]
}

const FORMER = 'a former member'
const fixed = (v: number, digits: number): string => (Number.isFinite(v) ? v.toFixed(digits) : '—')
/** "2026-12-02 16:40 UTC": the same text on the server (CSV) and in any browser time zone. */
export const utcMinute = (iso: string): string =>
  Number.isNaN(Date.parse(iso)) ? '—' : `${new Date(iso).toISOString().slice(0, 16).replace('T', ' ')} UTC`

function inputsTable({ frame, solver, figures }: ReportInput, loops: string[]): ReportTable {
  const rows: [string, string, string][] = [
    ['Prestress, warp', fixed(frame.prestress.warp, 2), 'kN/m'],
    ['Prestress, fill', fixed(frame.prestress.fill, 2), 'kN/m'],
  ]
  if (frame.prestress.warpAngle !== undefined) {
    rows.push(['Warp direction in plan (counter-clockwise from +x)', fixed(frame.prestress.warpAngle, 1), '°'])
  }
  rows.push(['Element size (target edge length)', fixed(frame.mesh.edgeLength, 3), 'm'])
  frame.loops.forEach((loop, l) =>
    loop.edges.forEach((e, i) => {
      if (e.kind === 'cable') rows.push([`Cable tension ${edgeName(loops[l]!, i)}`, fixed(e.tension ?? NaN, 1), 'kN'])
    }),
  )
  rows.push(
    ['Solver method', solver.method, ''],
    ['Solver iterations', String(solver.iterations), ''],
    ['Solver residual (normalised)', solver.residual.toExponential(2), ''],
    ['Solver state', solver.converged ? 'settled' : `unsettled: ${reasonWords(solver.reason)}`, ''],
  )
  if (solver.stressDeviation) {
    rows.push(
      ['Settled stress off warp/fill, largest (face)', fixed(solver.stressDeviation.max, 1), '%'],
      ['Settled stress off warp/fill, RMS (area-weighted)', fixed(solver.stressDeviation.rms, 1), '%'],
    )
  }
  rows.push(['Flat threshold', fixed(figures.flatThreshold, 1), '°'])
  return {
    key: 'inputs',
    title: 'Inputs and solver',
    columns: [{ label: 'Input' }, { label: 'Value' }, { label: 'Unit' }],
    rows,
  }
}

function pointsTable({ frame }: ReportInput, loops: string[]): ReportTable {
  const rows = frame.loops.flatMap((loop, l) =>
    loop.points.map((p, i) => {
      const e = loop.edges[i]
      const edge = e?.kind === 'cable' ? `${edgeName(loops[l]!, i)} cable` : `${edgeName(loops[l]!, i)} rigid`
      return [pointName(loops[l]!, i), p.x, p.y, p.z, edge]
    }),
  )
  const m = { unit: 'm', digits: 3 }
  return {
    key: 'frame-points',
    title: 'Frame points',
    note: 'Edge Ei starts at point Pi and ends at the next point of its loop.',
    columns: [
      { label: 'Point' },
      { label: 'x', ...m },
      { label: 'y', ...m },
      { label: 'z', ...m },
      { label: 'Edge from here' },
    ],
    rows,
  }
}

function edgesTable({ frame, figures }: ReportInput, loops: string[]): ReportTable {
  const rows = frame.loops.flatMap((loop, l) =>
    loop.edges.map((e, i) => {
      const n = loop.points.length
      const a = loop.points[i]!,
        b = loop.points[(i + 1) % n]!
      const chord = Math.hypot(b.x - a.x, b.y - a.y, b.z - a.z)
      const cable = e.kind === 'cable' ? figures.cables.find((c) => c.loop === l && c.edge === i) : undefined
      return [
        edgeName(loops[l]!, i),
        `${pointLabel(i)}–${pointLabel((i + 1) % n)}`,
        e.kind,
        e.kind === 'cable' ? (e.tension ?? null) : null,
        chord,
        cable?.length ?? null,
        cable?.sag ?? null,
      ]
    }),
  )
  return {
    key: 'frame-edges',
    title: 'Frame edges',
    note: 'Cable length along the solved edge and largest sag from the chord, prestress state.',
    columns: [
      { label: 'Edge' },
      { label: 'Joins' },
      { label: 'Kind' },
      { label: 'Tension', unit: 'kN', digits: 1 },
      { label: 'Chord', unit: 'm', digits: 3 },
      { label: 'Cable length', unit: 'm', digits: 3 },
      { label: 'Sag', unit: 'm', digits: 3 },
    ],
    rows,
  }
}

function forcesTable({ figures }: ReportInput, loops: string[]): ReportTable {
  const rows = figures.reactions.map(([l, p, fx, fy, fz]) => {
    const h = Math.hypot(fx, fy)
    return [
      pointName(loops[l] ?? `Loop ${l + 1}`, p),
      fx,
      fy,
      fz,
      Math.hypot(h, fz),
      (Math.atan2(fz, h) * 180) / Math.PI,
    ]
  })
  const kN = { unit: 'kN', digits: 2 }
  return {
    key: 'forces',
    title: 'Forces at frame points (prestress state)',
    note: 'The pull of membrane and cables on each frame point under prestress alone, before wind, snow or any other load; the support reaction is equal and opposite. Angle from horizontal: positive when the pull points up.',
    columns: [
      { label: 'Point' },
      { label: 'Fx', ...kN },
      { label: 'Fy', ...kN },
      { label: 'Fz', ...kN },
      { label: 'Resultant', ...kN },
      { label: 'Angle from horizontal', unit: '°', digits: 1 },
    ],
    rows,
  }
}

function figuresTable({ figures: f }: ReportInput): ReportTable {
  const rows: [string, string, string][] = [
    ['Fabric area', fixed(f.area, 2), 'm²'],
    ['Plan area', fixed(f.planArea, 2), 'm²'],
    ['Perimeter', fixed(f.perimeter, 2), 'm'],
    ['Lowest point', fixed(f.heightRange[0], 3), 'm'],
    ['Highest point', fixed(f.heightRange[1], 3), 'm'],
    ['Smallest slope', fixed(f.slopeRange[0], 1), '°'],
    ['Largest slope', fixed(f.slopeRange[1], 1), '°'],
    [`Flat share (slope under ${f.flatThreshold}°: ponding and flutter risk)`, fixed(f.flatShare * 100, 1), '%'],
    ['Anticlastic share', fixed(f.anticlasticShare * 100, 1), '%'],
    ['Ponding pockets', String(f.pondingPockets.length), ''],
    ['Smallest mesh angle', fixed(f.minAngle, 1), '°'],
  ]
  return {
    key: 'figures',
    title: 'Figures (prestress state)',
    columns: [{ label: 'Figure' }, { label: 'Value' }, { label: 'Unit' }],
    rows,
  }
}

function pocketsTable({ figures }: ReportInput): ReportTable {
  const m = { unit: 'm', digits: 3 }
  return {
    key: 'ponding-pockets',
    title: 'Ponding pockets',
    note: 'Interior low points that would hold water in the prestress state.',
    columns: [
      { label: 'Pocket' },
      { label: 'x', ...m },
      { label: 'y', ...m },
      { label: 'z', ...m },
      { label: 'Ponded plan area', unit: 'm²', digits: 2 },
    ],
    rows: figures.pondingPockets.map((p, i) => [`${i + 1}`, p.x, p.y, p.z, p.area]),
  }
}

function pinsTable({ pins }: ReportInput): ReportTable {
  const m = { unit: 'm', digits: 2 }
  return {
    key: 'pins',
    title: 'Open pins',
    note: 'Numbered as marked on the plan, oldest first.',
    columns: [
      { label: 'Pin' },
      { label: 'x', ...m },
      { label: 'y', ...m },
      { label: 'z', ...m },
      { label: 'Author', text: true },
      { label: 'Date' },
      { label: 'Comment', text: true },
      { label: 'Replies', text: true },
    ],
    rows: pins.map((p, i) => [
      `${i + 1}`,
      p.x,
      p.y,
      p.z,
      p.author?.name ?? FORMER,
      utcMinute(p.createdAt),
      p.body,
      p.replies.map((r) => `${r.author?.name ?? FORMER} (${utcMinute(r.createdAt)}): ${r.body}`).join('\n') || null,
    ]),
  }
}

/** Every table of the report, in page order; ponding pockets only when there are any. */
export function reportTables(input: ReportInput): ReportTable[] {
  const loops = loopNames(input.frame.loops)
  const tables = [
    inputsTable(input, loops),
    pointsTable(input, loops),
    edgesTable(input, loops),
    forcesTable(input, loops),
    figuresTable(input),
  ]
  if (input.figures.pondingPockets.length) tables.push(pocketsTable(input))
  tables.push(pinsTable(input))
  return tables
}
