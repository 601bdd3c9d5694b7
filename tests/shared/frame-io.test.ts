import { describe, expect, it } from 'vitest'
import { FrameError, frameToCsv, frameToJson, parseFrameCsv, parseFrameJson } from '../../shared/frame'
import { circleLoop, frameFile, squareLoop } from './frame-fixtures'

function csvRefusal(text: string): FrameError {
  try {
    parseFrameCsv(text)
  } catch (err) {
    if (err instanceof FrameError) return err
    throw err
  }
  throw new Error('expected the CSV to be refused')
}

describe('CSV frames', () => {
  it('reads loops, optional header, comments, cable edges and the "outer" label', () => {
    const text = [
      '# courtyard sail, our own scenario',
      'loop,x,y,z,edge,tension',
      'outer,0,0,0,rigid,',
      'outer,10,0,1,cable,40',
      '0,10,10,0',
      '0,0,10,1',
      '',
      '1,4,4,3',
      '1,4,6,3',
      '1,6,6,3',
      '1,6,4,3',
    ].join('\n')
    const f = parseFrameCsv(text, { edgeLength: 0.4, prestress: { warp: 2, fill: 2 } })
    expect(f.loops.map((l) => [l.role, l.points.length])).toEqual([
      ['outer', 4],
      ['hole', 4],
    ])
    expect(f.loops[0]!.edges[1]).toEqual({ kind: 'cable', tension: 40 })
    expect(f.loops[0]!.edges[2]).toEqual({ kind: 'rigid' })
    expect(f.loops[1]!.points[2]).toMatchObject({ x: 6, y: 6, z: 3 })
    expect(f.mesh.edgeLength).toBe(0.4)
    expect(f.prestress.warp).toBe(2)
    // header is optional
    expect(parseFrameCsv('0,0,0,0\n0,1,0,0\n0,1,1,0\n').loops[0]!.points).toHaveLength(3)
  })

  it('names line and column for bad cells', () => {
    expect(csvRefusal('loop,x,y,z\n0,0,0,0\n0,1,0,0\n0,1,abc,0\n')).toMatchObject({
      code: 'invalid-field',
      field: 'line 4, column y',
    })
    expect(csvRefusal('0,0,0,0\n0,1,0,0\n0,1,1,Infinity\n')).toMatchObject({
      code: 'not-finite',
      field: 'line 3, column z',
    })
    expect(csvRefusal('0,0,0,0\n0,1,0,0,strap\n0,1,1,0\n')).toMatchObject({
      code: 'unknown-edge-kind',
      field: 'line 2, column edge',
    })
    expect(csvRefusal('0,0,0\n')).toMatchObject({ code: 'csv-syntax', field: 'line 1' })
    expect(csvRefusal('x,0,0,0\n')).toMatchObject({ code: 'csv-syntax', field: 'line 1, column loop' })
  })

  it('maps geometric errors back to CSV lines', () => {
    // cable without tension on the row at line 3
    expect(csvRefusal('0,0,0,0\n0,4,0,0\n0,4,4,0,cable\n0,0,4,0\n')).toMatchObject({
      code: 'cable-tension',
      field: 'line 3, column tension',
    })
    // the repeated point is the row at line 4
    expect(csvRefusal('0,0,0,0\n0,4,0,0\n0,4,4,0\n0,4,4,1\n0,0,4,0\n')).toMatchObject({
      code: 'repeated-point',
      field: 'line 4, column x',
    })
  })
})

describe('round trips', () => {
  const file = frameFile(
    squareLoop(12, 3, -2, (i) => i),
    [circleLoop(9, 1.5, 9, 4, 5, true)],
    0.3,
  )
  it('JSON export re-imports unchanged', () => {
    const f = parseFrameJson({
      ...file,
      prestress: { warp: 4, fill: 2.5, warpAngle: -35 },
      loops: [
        {
          role: 'outer',
          points: squareLoop(12, 3, -2, (i) => i),
          edges: [
            { kind: 'cable', tension: 12.5 },
            { kind: 'rigid', tension: 4 },
            { kind: 'rigid' },
            { kind: 'rigid' },
          ],
        },
        (file.loops as unknown[])[1],
      ],
    })
    const again = parseFrameJson(frameToJson(f))
    expect(again).toEqual(f)
    expect(frameToJson(again)).toBe(frameToJson(f))
    // a tension on a rigid edge means nothing and is dropped
    expect(f.loops[0]!.edges[1]).toEqual({ kind: 'rigid' })
  })

  it('CSV export re-imports the same geometry and edges', () => {
    const f = parseFrameJson(file)
    const back = parseFrameCsv(frameToCsv(f), { edgeLength: f.mesh.edgeLength, prestress: f.prestress })
    expect(back.loops.map((l) => l.points.map(({ x, y, z }) => [x, y, z]))).toEqual(
      f.loops.map((l) => l.points.map(({ x, y, z }) => [x, y, z])),
    )
    expect(back.loops.map((l) => l.edges)).toEqual(f.loops.map((l) => l.edges))
  })
})
