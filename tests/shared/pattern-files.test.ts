/** Cuts and surface files (errors name the field), DXF/SVG/cutting sheet, and `npm run pattern`. */
import { spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { cuttingSheetHtml, patternToDxf, patternToSvg } from '../../shared/export'
import { computePattern, parseCutsFile, parseSurfaceFile, PatternError } from '../../shared/pattern'
import { structuredMesh } from '../helpers/meshes'

const good = {
  format: 'veilroom-cuts',
  version: 1,
  warpAngle: 0,
  compensation: { warp: 1, fill: 0.5 },
  seamAllowance: 0.05,
  rollWidth: 2.5,
  seams: [
    { kind: 'plane', point: [2, 0, 0], normal: [1, 0, 0] },
    { kind: 'geodesic', from: [0, 0, 0], to: [4, 4, 0] },
  ],
}
function refusal(input: unknown, parse: (x: unknown) => unknown = parseCutsFile): PatternError {
  try {
    parse(input)
  } catch (err) {
    if (err instanceof PatternError) return err
    throw err
  }
  throw new Error('accepted')
}

describe('cuts file', () => {
  it('reads the documented shape', () => {
    const c = parseCutsFile(JSON.stringify(good))
    expect(c.seams).toHaveLength(2)
    expect(c.compensation.fill).toBe(0.5)
  })

  it('names the field and the reason', () => {
    expect(refusal('{').code).toBe('invalid-json')
    expect(refusal({ ...good, rollWidth: -1 }).field).toBe('rollWidth')
    expect(refusal({ ...good, format: 'frame' }).field).toBe('format')
    const nan = refusal({ ...good, seams: [{ kind: 'plane', point: [0, Number.NaN, 0], normal: [1, 0, 0] }] })
    expect([nan.field, nan.code]).toEqual(['seams[0].point[1]', 'not-finite'])
    const kind = refusal({ ...good, seams: [{ kind: 'spiral', from: [0, 0, 0] }] })
    expect([kind.field, kind.code]).toEqual(['seams[0].kind', 'unknown-seam-kind'])
    expect(refusal({ ...good, seams: [{ kind: 'geodesic', from: [0, 0], to: [1, 1, 1] }] }).field).toBe('seams[0].from')
    const zero = refusal({ ...good, seams: [{ kind: 'plane', point: [0, 0, 0], normal: [0, 0, 0] }] })
    expect([zero.field, zero.code]).toEqual(['seams[0].normal', 'zero-normal'])
    expect(refusal({ ...good, compensation: { warp: 50, fill: 0 } }).field).toBe('compensation.warp')
  })

  it('refuses a surface with an index out of range, naming the triangle', () => {
    const e = refusal(
      {
        vertices: [
          [0, 0, 0],
          [1, 0, 0],
          [0, 1, 0],
        ],
        triangles: [[0, 1, 3]],
      },
      parseSurfaceFile,
    )
    expect([e.field, e.code]).toEqual(['triangles[0][2]', 'index-out-of-range'])
    expect(refusal({ vertices: [[0, 0, 0]], triangles: [] }, parseSurfaceFile).field).toBe('vertices')
  })

  it('names the seam that misses the surface', () => {
    const mesh = structuredMesh(4, 4, (s, t) => [4 * s, 4 * t, 0])
    expect(() =>
      computePattern(mesh, { ...parseCutsFile(good), seams: [{ kind: 'plane', point: [9, 0, 0], normal: [1, 0, 0] }] }),
    ).toThrow(/seams\[0\]: this seam does not cross/)
  })
})

describe('drawings', () => {
  const mesh = structuredMesh(8, 8, (s, t) => [4 * s, 4 * t, 0.2 * (s - 0.5) * (t - 0.5)])
  const { result } = computePattern(mesh, parseCutsFile(good))

  it('DXF: one closed polyline per cut line and per outline, a label and a warp arrow per strip, the caution', () => {
    const dxf = patternToDxf(result)
    const lines = dxf.split('\r\n')
    const count = (layer: string, entity: string) =>
      lines.filter((l, i) => l === entity && lines[i - 1] === '0' && lines[i + 2] === layer).length
    // the plane x = 2 and the diagonal geodesic cross: four pieces
    expect(result.strips.length).toBe(4)
    expect(count('CUT', 'POLYLINE')).toBe(4)
    expect(count('OUTLINE', 'POLYLINE')).toBe(4)
    expect(count('LABEL', 'TEXT')).toBe(4)
    expect(count('WARP', 'LINE')).toBe(12)
    // closed flag 70 = 1 on every polyline
    lines.forEach((l, i) => {
      if (l === 'POLYLINE') expect(lines.slice(i, i + 12).join('|')).toMatch(/\|70\|1\|/)
    })
    expect(dxf).toContain('engineer of record')
    expect(lines.at(-2)).toBe('EOF')
  })

  it('SVG and the cutting sheet carry every strip and the caution', () => {
    const svg = patternToSvg(result)
    expect(svg.match(/data-strip=/g)).toHaveLength(4)
    expect(svg).toContain('biaxial test')
    const sheet = cuttingSheetHtml(result, parseCutsFile(good), 'Sail <A>')
    expect(sheet).toContain('Sail &lt;A&gt;')
    expect(sheet.match(/engineer of record/g)!.length).toBeGreaterThanOrEqual(2)
    expect(sheet).toContain('<td>S1 | S2</td>')
  })
})

describe('npm run pattern', () => {
  const dir = mkdtempSync(join(tmpdir(), 'veilroom-pattern-'))
  const run = (...args: string[]) =>
    spawnSync(process.execPath, ['--import', 'tsx', 'scripts/pattern.ts', ...args], {
      encoding: 'utf8',
      timeout: 60_000,
    })
  const mesh = structuredMesh(8, 8, (s, t) => [4 * s, 4 * t, 0.2 * (s - 0.5) * (t - 0.5)])
  const surface = join(dir, 'surface.json')
  writeFileSync(
    surface,
    JSON.stringify({
      vertices: Array.from({ length: mesh.vertices.length / 3 }, (_, i) =>
        Array.from(mesh.vertices.subarray(3 * i, 3 * i + 3)),
      ),
      triangles: Array.from({ length: mesh.triangles.length / 3 }, (_, i) =>
        Array.from(mesh.triangles.subarray(3 * i, 3 * i + 3)),
      ),
      figures: {},
      solver: {},
    }),
  )

  it('writes PATTERN.json, DXF and SVG and prints the caution', () => {
    const cuts = join(dir, 'cuts.json')
    writeFileSync(cuts, JSON.stringify(good))
    const r = run(
      surface,
      '--cuts',
      cuts,
      '--out',
      join(dir, 'p.json'),
      '--dxf',
      join(dir, 'p.dxf'),
      '--svg',
      join(dir, 'p.svg'),
    )
    expect(r.stderr).toBe('')
    expect(r.status).toBe(0)
    expect(r.stdout).toMatch(/engineer of record/)
    const pattern = JSON.parse(readFileSync(join(dir, 'p.json'), 'utf8'))
    expect(Object.keys(pattern.strips[0]).sort()).toEqual([
      'area3d',
      'areaFlat',
      'cutLine',
      'id',
      'length',
      'outline',
      'overWidth',
      'seams',
      'strain',
      'width',
    ])
    expect(Object.keys(pattern.strips[0].seams[0]).sort()).toEqual(['length3d', 'lengthFlat', 'mismatch', 'with'])
    expect(pattern.caution).toMatch(/fabricator/)
    expect(readFileSync(join(dir, 'p.dxf'), 'utf8')).toMatch(/ENTITIES/)
  })

  it('exits 2 naming the field of a bad cuts file, 1 on usage errors', () => {
    const cuts = join(dir, 'bad.json')
    writeFileSync(cuts, JSON.stringify({ ...good, seamAllowance: 'wide' }))
    const r = run(surface, '--cuts', cuts, '--out', join(dir, 'x.json'))
    expect(r.status).toBe(2)
    expect(r.stderr).toMatch(/seamAllowance/)
    expect(run(surface).status).toBe(1)
  })
})
