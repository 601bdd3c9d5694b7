import { describe, expect, it } from 'vitest'
import { figuresToCsv } from '../../shared/export'
import { computeFigures } from '../../shared/figures'
import { parseFrameJson } from '../../shared/frame'
import { meshFrame } from '../../shared/mesh'
import { reportTables, type ReportInput, type ReportTable } from '../../shared/report'
import type { SolverReport } from '../../shared/types'
import { circleLoop, frameFile, squareLoop } from './frame-fixtures'

const solver: SolverReport = { method: 'test-start-mesh', iterations: 0, residual: 0, converged: true, ms: 0 }
const table = (tables: ReportTable[], key: string): ReportTable => tables.find((t) => t.key === key)!

/** A flat 4 m square at prestress 3 kN/m with a mast ring, one cable, two open pins. */
function squareInput(): ReportInput {
  const file = frameFile(squareLoop(4, 10, 20), [circleLoop(8, 0.5, 12, 22, 0, true)], 0.4)
  const frame = parseFrameJson(file)
  const figures = computeFigures(meshFrame(frame), frame)
  const pins = [
    {
      x: 11,
      y: 21,
      z: 0,
      body: 'Check the corner plate, please',
      author: { name: 'Ada Reviewer' },
      createdAt: '2026-12-01T09:30:00.000Z',
      replies: [],
    },
    {
      x: 13,
      y: 23,
      z: 0,
      body: 'Ring height "TBC", see note',
      author: null,
      createdAt: '2026-12-02T10:00:00.000Z',
      replies: [{ body: 'Raised, see v2', author: { name: 'Bo Editor' }, createdAt: '2026-12-02T11:15:00.000Z' }],
    },
  ]
  return { frame, figures, solver, pins }
}

describe('report tables', () => {
  it('numbers points and edges 1-based with loop names, as the workbench does', () => {
    const tables = reportTables(squareInput())
    const points = table(tables, 'frame-points').rows.map((r) => r[0])
    expect(points.slice(0, 4)).toEqual(['Outer P1', 'Outer P2', 'Outer P3', 'Outer P4'])
    expect(points.slice(4, 6)).toEqual(['Hole 1 P1', 'Hole 1 P2'])
    const edges = table(tables, 'frame-edges').rows
    expect(edges[3]!.slice(0, 3)).toEqual(['Outer E4', 'P4–P1', 'rigid'])
    // chord of E1 is the square's side
    expect(edges[0]![4]).toBeCloseTo(4, 12)
  })

  it('forces on the corners of a flat square equal the edge line load shared half to each end (statics: a line load w on a span L puts wL/2 on each support)', () => {
    const input = squareInput()
    // Without the ring, each corner takes σ·s/2 from each of its two edges, at right angles.
    const frame = parseFrameJson(frameFile(squareLoop(4, 10, 20), [], 0.4))
    const tables = reportTables({ ...input, frame, figures: computeFigures(meshFrame(frame), frame) })
    const rows = table(tables, 'forces').rows
    expect(rows).toHaveLength(4)
    for (const [name, fx, fy, fz, resultant, angle] of rows) {
      expect(name).toMatch(/^Outer P[1-4]$/)
      expect(Math.abs(fx as number)).toBeCloseTo((3 * 4) / 2, 6)
      expect(Math.abs(fy as number)).toBeCloseTo((3 * 4) / 2, 6)
      expect(fz as number).toBeCloseTo(0, 9)
      expect(resultant as number).toBeCloseTo((3 * 4) / Math.SQRT2, 6)
      expect(angle as number).toBeCloseTo(0, 6)
    }
  })

  it('angle from horizontal is positive for an upward pull (atan2 of Fz over the plan component)', () => {
    const input = squareInput()
    const figures = {
      ...input.figures,
      reactions: [
        [0, 2, 3, 4, 5] as [number, number, number, number, number],
        [0, 3, 0, 0, -2] as [number, number, number, number, number],
      ],
    }
    const rows = table(reportTables({ ...input, figures }), 'forces').rows
    expect(rows[0]).toEqual(['Outer P3', 3, 4, 5, expect.closeTo(Math.sqrt(50), 12), expect.closeTo(45, 12)])
    expect(rows[1]![5]).toBeCloseTo(-90, 12)
  })

  it('lists the inputs: prestress, warp direction when present, element size, cable tensions, solver', () => {
    const input = squareInput()
    const loops = input.frame.loops.map((l, i) =>
      i === 0 ? { ...l, edges: l.edges.map((e, k) => (k === 1 ? { kind: 'cable' as const, tension: 25 } : e)) } : l,
    )
    const rows = table(reportTables({ ...input, frame: { ...input.frame, loops } }), 'inputs').rows.map((r) =>
      r.join(' '),
    )
    expect(rows).toContain('Prestress, warp 3.00 kN/m')
    expect(rows).toContain('Element size (target edge length) 0.400 m')
    expect(rows).toContain('Cable tension Outer E2 25.0 kN')
    expect(rows).toContain('Solver method test-start-mesh ')
    expect(rows).toContain('Warp direction in plan (counter-clockwise from +x) 0.0 °')
    // a snapshot saved before frames carried a warp direction shows none rather than a guess
    const older = reportTables({ ...input, frame: { ...input.frame, prestress: { warp: 3, fill: 3 } } })
    expect(table(older, 'inputs').rows.some((r) => String(r[0]).startsWith('Warp direction'))).toBe(false)
    const angled = reportTables({
      ...input,
      frame: { ...input.frame, prestress: { warp: 4, fill: 2, warpAngle: 30 } },
      solver: { ...solver, stressDeviation: { max: 3.25, rms: 1.04 } },
    })
    const angledRows = table(angled, 'inputs').rows.map((r) => r.join(' '))
    expect(angledRows).toContain('Warp direction in plan (counter-clockwise from +x) 30.0 °')
    expect(angledRows).toContain('Settled stress off warp/fill, largest (face) 3.3 %')
    expect(angledRows).toContain('Settled stress off warp/fill, RMS (area-weighted) 1.0 %')
  })

  it('numbers open pins oldest first with author, date, text and replies', () => {
    const rows = table(reportTables(squareInput()), 'pins').rows
    expect(rows[0]).toEqual([
      '1',
      11,
      21,
      0,
      'Ada Reviewer',
      '2026-12-01 09:30 UTC',
      'Check the corner plate, please',
      null,
    ])
    expect(rows[1]![4]).toBe('a former member')
    expect(rows[1]![7]).toBe('Bo Editor (2026-12-02 11:15 UTC): Raised, see v2')
  })
})

/** RFC 4180 fields of one CSV line (quotes doubled inside quoted fields). */
function csvFields(line: string): string[] {
  return [...line.matchAll(/("(?:[^"]|"")*"|[^,]*)(,|$)/g)]
    .slice(0, -1)
    .map((m) => m[1]!.replace(/^"|"$/g, '').replace(/""/g, '"'))
}

describe('figures CSV', () => {
  it('writes one section per report table, with the caution first (RFC 4180 quoting)', () => {
    const input = squareInput()
    const csv = figuresToCsv(input, 'Preliminary: check with an engineer.')
    const sections = csv.trim().split('\n\n')
    expect(sections[0]).toBe('# Preliminary: check with an engineer.')
    const titles = sections.slice(1).map((s) => s.split('\n')[0])
    expect(titles).toEqual(reportTables(input).map((t) => `# ${t.title}`))
    const points = sections
      .find((s) => s.startsWith('# Frame points\n'))!
      .split('\n')
      .filter((l) => !l.startsWith('#'))
    expect(points[0]).toBe('Point,x (m),y (m),z (m),Edge from here')
    expect(csvFields(points[1]!)).toEqual(['Outer P1', '10.000', '20.000', '0.000', 'Outer E1 rigid'])
    const pins = sections.find((s) => s.startsWith('# Open pins\n'))!
    expect(pins).toContain('"Ring height ""TBC"", see note"')
  })
})
