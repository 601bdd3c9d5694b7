import { describe, expect, it } from 'vitest'
import {
  FrameError,
  parseFrameJson,
  frameNeedsSpatialSolve,
  frameNeedsParametricMesh,
  frameIsHeightField,
} from '../../shared/frame'
import { circleLoop, frameFile, squareLoop } from './frame-fixtures'

/** Run the parser and return the FrameError it throws (fails the test when none). */
function refusal(input: unknown): FrameError {
  try {
    parseFrameJson(input)
  } catch (err) {
    if (err instanceof FrameError) return err
    throw err
  }
  throw new Error('expected the frame to be refused')
}

// Each case: a frame that no membrane can span (or that the engine cannot take), the field that
// must be named and the reason. The geometry is elementary (crossing segments, point in polygon).
describe('frame validation names the field and the reason', () => {
  it('accepts a plain square and fills defaults', () => {
    const f = parseFrameJson({ loops: [{ role: 'outer', points: squareLoop(4) }] })
    expect(f.prestress).toEqual({ warp: 3, fill: 3, warpAngle: 0 })
    expect(f.mesh.edgeLength).toBeCloseTo(Math.hypot(4, 4) / 40, 12)
    expect(f.loops[0]!.edges.every((e) => e.kind === 'rigid')).toBe(true)
    expect(f.loops[0]!.points.map((p) => p.id)).toEqual(['p1', 'p2', 'p3', 'p4'])
  })

  it('warp direction: kept as given, 0 when left out, refused when not a finite angle', () => {
    const square = { role: 'outer', points: squareLoop(4) }
    expect(parseFrameJson({ prestress: { warp: 4, fill: 2, warpAngle: 30 }, loops: [square] }).prestress).toEqual({
      warp: 4,
      fill: 2,
      warpAngle: 30,
    })
    expect(parseFrameJson({ prestress: { warp: 4, fill: 2 }, loops: [square] }).prestress.warpAngle).toBe(0)
    expect(refusal({ prestress: { warp: 4, fill: 2, warpAngle: 'east' }, loops: [square] }).field).toBe(
      'prestress.warpAngle',
    )
    expect(refusal({ prestress: { warp: 4, fill: 2, warpAngle: Infinity }, loops: [square] })).toMatchObject({
      code: 'not-finite',
      field: 'prestress.warpAngle',
    })
  })

  it('fewer than 3 points', () => {
    const e = refusal(frameFile(squareLoop(4).slice(0, 2)))
    expect([e.code, e.field]).toEqual(['too-few-points', 'loops[0].points'])
  })

  it('repeated consecutive points', () => {
    const pts = squareLoop(4)
    pts.splice(2, 0, { ...pts[1]! })
    const e = refusal(frameFile(pts))
    expect([e.code, e.field]).toEqual(['repeated-point', 'loops[0].points[2]'])
  })

  it('NaN and Infinity', () => {
    const pts = squareLoop(4)
    pts[3] = { x: 0, y: NaN, z: 0 }
    expect(refusal(frameFile(pts))).toMatchObject({ code: 'not-finite', field: 'loops[0].points[3].y' })
    pts[3] = { x: 0, y: 4, z: Infinity }
    expect(refusal(frameFile(pts))).toMatchObject({ code: 'not-finite', field: 'loops[0].points[3].z' })
  })

  it('self-crossing loop (bow tie)', () => {
    const pts = [
      { x: 0, y: 0, z: 0 },
      { x: 4, y: 4, z: 0 },
      { x: 4, y: 0, z: 0 },
      { x: 0, y: 4, z: 0 },
    ]
    const e = refusal(frameFile(pts))
    expect(e.code).toBe('self-crossing')
    expect(e.field).toMatch(/^loops\[0\]\.edges\[\d\]$/)
    expect(e.reason).toMatch(/crosses/)
  })

  it('hole outside the outer loop', () => {
    const e = refusal(frameFile(squareLoop(4), [circleLoop(6, 0.5, 10, 10, 0, true)]))
    expect([e.code, e.field]).toEqual(['hole-outside', 'loops[1]'])
  })

  it('hole crossing the outer loop, holes crossing each other, hole inside a hole', () => {
    expect(refusal(frameFile(squareLoop(4), [circleLoop(6, 1, 4, 2)])).code).toBe('loops-crossing')
    const two = refusal(frameFile(squareLoop(10), [circleLoop(8, 1, 4, 5), circleLoop(8, 1, 5, 5)]))
    expect([two.code, two.field.startsWith('loops[1].edges[')]).toEqual(['loops-crossing', true])
    const nested = refusal(frameFile(squareLoop(10), [circleLoop(8, 2, 5, 5), circleLoop(8, 0.5, 5, 5)]))
    expect([nested.code, nested.field]).toEqual(['loops-crossing', 'loops[1]'])
  })

  it('cable tension missing or not positive, unknown edge kind', () => {
    const edges = (e1: unknown) => [{ kind: 'rigid' }, e1, { kind: 'rigid' }, { kind: 'rigid' }]
    const base = frameFile(squareLoop(4))
    const withEdges = (e1: unknown) => ({
      ...base,
      loops: [{ role: 'outer', points: squareLoop(4), edges: edges(e1) }],
    })
    expect(refusal(withEdges({ kind: 'cable' }))).toMatchObject({
      code: 'cable-tension',
      field: 'loops[0].edges[1].tension',
    })
    expect(refusal(withEdges({ kind: 'cable', tension: 0 }))).toMatchObject({
      code: 'cable-tension',
      field: 'loops[0].edges[1].tension',
    })
    expect(refusal(withEdges({ kind: 'cable', tension: -5 })).reason).toMatch(/> 0 kN/)
    expect(refusal(withEdges({ kind: 'rope' }))).toMatchObject({
      code: 'unknown-edge-kind',
      field: 'loops[0].edges[1].kind',
    })
  })

  it('prestress and edge length must be positive', () => {
    expect(refusal(frameFile(squareLoop(4), [], 0.5, { prestress: { warp: 0, fill: 3 } }))).toMatchObject({
      code: 'prestress',
      field: 'prestress.warp',
    })
    expect(refusal(frameFile(squareLoop(4), [], 0.5, { prestress: { warp: 3, fill: -1 } }))).toMatchObject({
      code: 'prestress',
      field: 'prestress.fill',
    })
    expect(refusal(frameFile(squareLoop(4), [], 0))).toMatchObject({ code: 'edge-length', field: 'mesh.edgeLength' })
  })

  it('limits: too many frame points, mesh too fine', () => {
    expect(refusal(frameFile(circleLoop(2001, 100)))).toMatchObject({
      code: 'too-many-points',
      field: 'loops[0].points',
    })
    expect(refusal(frameFile(circleLoop(1000, 50), [circleLoop(1001, 10, 0, 0, 0, true)], 5))).toMatchObject({
      code: 'too-many-points',
      field: 'loops',
    })
    // 100 m × 100 m at h = 0.2 m: 10⁴ / (0.866 · 0.04) ≈ 289 000 vertices > 100 000 (hexagonal lattice, elementary geometry)
    const fine = refusal(frameFile(squareLoop(100), [], 0.2))
    expect([fine.code, fine.field]).toEqual(['mesh-too-fine', 'mesh.edgeLength'])
    expect(fine.reason).toMatch(/mesh too fine/)
  })

  it('exactly one outer loop, listed first', () => {
    const file = frameFile(squareLoop(4))
    const twoOuter = {
      ...file,
      loops: [
        { role: 'outer', points: squareLoop(4) },
        { role: 'outer', points: squareLoop(1, 1, 1) },
      ],
    }
    expect(refusal(twoOuter)).toMatchObject({ code: 'outer-loop-count', field: 'loops' })
    const noOuter = { ...file, loops: [{ role: 'hole', points: squareLoop(4) }] }
    expect(refusal(noOuter).code).toBe('outer-loop-count')
  })

  it('schema errors name the path', () => {
    expect(refusal({ loops: [{ role: 'outer', points: [{ x: 0, y: 0 }] }] })).toMatchObject({
      code: 'invalid-field',
      field: 'loops[0].points[0].z',
    })
    expect(refusal('{ not json')).toMatchObject({ code: 'invalid-json' })
    const e = refusal({
      ...frameFile(squareLoop(4)),
      loops: [{ role: 'outer', points: squareLoop(4), edges: [{ kind: 'rigid' }] }],
    })
    expect([e.code, e.field]).toEqual(['invalid-field', 'loops[0].edges'])
  })
})

describe('spatial rule (documented in shared/frame/validate.ts)', () => {
  it('two coaxial rings apart in height are accepted as a spatial frame', () => {
    const f = parseFrameJson(frameFile(circleLoop(24, 1, 0, 0, 0), [circleLoop(24, 1, 0, 0, 1)], 0.1))
    expect(frameNeedsParametricMesh(f)).toBe(true)
    expect(frameNeedsSpatialSolve(f)).toBe(true)
    expect(frameIsHeightField(f)).toBe(false)
  })

  it('the same rings at overlapping heights are refused', () => {
    const e = refusal(frameFile(circleLoop(24, 1, 0, 0, 0), [circleLoop(24, 1, 0, 0, 0)], 0.1))
    expect(e.code).toBe('loops-crossing')
  })

  it('a mast ring inside the outer loop in plan is a height-field frame; a cable makes it spatial', () => {
    const f = parseFrameJson(frameFile(circleLoop(16, 7), [circleLoop(12, 0.6, 0, 0, 6, true)]))
    expect(frameIsHeightField(f)).toBe(true)
    const withCable = parseFrameJson({
      ...frameFile(squareLoop(4)),
      loops: [
        {
          role: 'outer',
          points: squareLoop(4),
          edges: [{ kind: 'cable', tension: 10 }, { kind: 'rigid' }, { kind: 'rigid' }, { kind: 'rigid' }],
        },
      ],
    })
    expect(frameNeedsSpatialSolve(withCable)).toBe(true)
    expect(frameNeedsParametricMesh(withCable)).toBe(false)
  })
})
