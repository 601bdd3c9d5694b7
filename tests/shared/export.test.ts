import { describe, expect, it } from 'vitest'
import { CAUTION } from '../../shared/protocol'
import { figuresToCsv, surfaceResultToJson, toObj, toStl, toSurfaceResult } from '../../shared/export'
import { computeFigures } from '../../shared/figures'
import { meshFrame } from '../../shared/mesh'
import { parseFrameJson } from '../../shared/frame'
import type { SolverReport } from '../../shared/types'
import { frameFile, squareLoop } from './frame-fixtures'

const frame = parseFrameJson(
  frameFile(
    squareLoop(3, 1, 2, (i) => i * 0.5),
    [],
    0.75,
  ),
)
const mesh = meshFrame(frame)
const report: SolverReport = { method: 'test-start-mesh', iterations: 0, residual: 0, converged: true, ms: 0 }
const result = toSurfaceResult(mesh, computeFigures(mesh, frame), report)

describe('exports', () => {
  it('surface result JSON has the PRODUCT.md shape plus the caution and survives a JSON round trip', () => {
    const { caution, ...back } = JSON.parse(surfaceResultToJson(result))
    expect(caution).toBe(CAUTION)
    expect(Object.keys(back).sort()).toEqual(['figures', 'solver', 'triangles', 'vertices'])
    expect(back.vertices).toHaveLength(mesh.vertices.length / 3)
    expect(back.triangles[0]).toHaveLength(3)
    expect(back).toEqual(result)
    expect(() => surfaceResultToJson({ ...result, solver: { ...report, residual: NaN } })).toThrow(/residual/)
  })

  it('OBJ: one v line per vertex, 1-based f lines (Wavefront OBJ specification)', () => {
    const lines = toObj(result).trim().split('\n')
    expect(lines.filter((l) => l.startsWith('v ')).length).toBe(result.vertices.length)
    const faces = lines.filter((l) => l.startsWith('f '))
    expect(faces.length).toBe(result.triangles.length)
    const [a, b, c] = result.triangles[0]!
    expect(faces[0]).toBe(`f ${a + 1} ${b + 1} ${c + 1}`)
    const v1 = lines
      .find((l) => l.startsWith('v '))!
      .split(' ')
      .slice(1)
      .map(Number)
    expect(v1).toEqual(result.vertices[0]!.map((x) => expect.closeTo(x, 9)))
  })

  it('ASCII STL: solid/facet/outer loop structure, unit normals along +z for a counter-clockwise plan mesh', () => {
    const stl = toStl(result)
    // ASCII STL has no comments: the caution rides in the solid name (first and last line)
    expect(stl.split('\n')[0]).toBe(`solid veilroom_surface Preliminary form-finding result: ${CAUTION}`)
    expect(stl.trim().endsWith(`endsolid veilroom_surface Preliminary form-finding result: ${CAUTION}`)).toBe(true)
    const normals = [...stl.matchAll(/facet normal (\S+) (\S+) (\S+)/g)].map((m) => m.slice(1).map(Number))
    expect(normals).toHaveLength(result.triangles.length)
    for (const n of normals) {
      expect(Math.hypot(n[0]!, n[1]!, n[2]!)).toBeCloseTo(1, 6)
      expect(n[2]!).toBeGreaterThan(0)
    }
    expect((stl.match(/vertex /g) ?? []).length).toBe(3 * result.triangles.length)
  })

  it('figures CSV: caution first, then the report tables with their figures and frame points', () => {
    const csv = figuresToCsv(
      { frame, figures: result.figures, solver: report, pins: [] },
      'Checked by a qualified engineer.',
    )
      .trim()
      .split('\n')
    expect(csv[0]).toBe('# Checked by a qualified engineer.')
    const area = csv.find((l) => l.startsWith('Fabric area,'))!.split(',')
    expect(Number(area[1])).toBeCloseTo(result.figures.area, 2)
    expect(csv.filter((l) => l.startsWith('Outer P')).length).toBe(2 * frame.loops[0]!.points.length)
  })
})
