/**
 * Flat patterns of doubly curved minimal surfaces (issue 11 checks; CHECKS.md "Scherk's first
 * surface", H. F. Scherk 1835): narrower strips give smaller greatest strain (a strip of width w on
 * a surface of Gaussian curvature K needs strain ~ |K|w²/8 to lie flat: Gauss's theorema egregium;
 * the w² scaling is common practice in patterning), flat area within 1 % of 3D area, seam
 * mismatch ≤ 1 mm; and a geodesic seam on a cylinder is the straight line of the development.
 */
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { solveFrame } from '../../shared/engine'
import { parseFrameJson } from '../../shared/frame'
import { computePattern, type CutSettings, type PlaneSeam, type TriangleMesh } from '../../shared/pattern'
import { placed, structuredMesh } from '../helpers/meshes'

const at = placed(0.4, 3, -2)
/** Scherk's first surface u = ln(cos y / cos x) over [−1, 1]², rotated 0.4 rad and shifted. */
const scherk = structuredMesh(48, 48, (s, t) => {
  const x = -1 + 2 * s,
    y = -1 + 2 * t
  const [px, py] = at(x, y)
  return [px, py, Math.log(Math.cos(y) / Math.cos(x))]
})
/** Planes across the (rotated) x axis every `spacing` m, warp along the rotated x axis. */
function parallelCuts(spacing: number): CutSettings {
  const seams: PlaneSeam[] = []
  for (let y = -1 + spacing; y < 1 - 1e-9; y += spacing) {
    const [px, py] = at(0, y)
    seams.push({ kind: 'plane', point: [px, py, 0], normal: [-Math.sin(0.4), Math.cos(0.4), 0] })
  }
  return {
    warpAngle: (0.4 * 180) / Math.PI,
    compensation: { warp: 0, fill: 0 },
    seamAllowance: 0,
    rollWidth: 2.5,
    seams,
  }
}
const greatest = (r: ReturnType<typeof computePattern>['result']) =>
  Math.max(...r.strips.map((s) => Math.max(s.strain.maxWarp, s.strain.maxFill)))
const worstMismatch = (r: ReturnType<typeof computePattern>['result']) =>
  Math.max(...r.strips.flatMap((s) => s.seams.map((x) => Math.abs(x.mismatch))))

describe("Scherk's surface cut into parallel strips", () => {
  const wide = computePattern(scherk, parallelCuts(0.5)).result
  const narrow = computePattern(scherk, parallelCuts(0.25)).result

  it('cuts 4 and 8 strips', () => {
    expect(wide.strips).toHaveLength(4)
    expect(narrow.strips).toHaveLength(8)
  })

  it('narrower strips give smaller greatest strain', () => {
    expect(greatest(narrow)).toBeLessThan(0.6 * greatest(wide))
    expect(narrow.strips.reduce((s, x) => s + x.strain.rms * x.area3d, 0)).toBeLessThan(
      wide.strips.reduce((s, x) => s + x.strain.rms * x.area3d, 0),
    )
  })

  it("keeps each flat area within 1 % of its 3D area and the whole within 1 % of Scherk's area 5.69751221", () => {
    for (const s of [...wide.strips, ...narrow.strips]) expect(Math.abs(s.areaFlat / s.area3d - 1)).toBeLessThan(0.01)
    const total = narrow.strips.reduce((a, s) => a + s.area3d, 0)
    expect(Math.abs(total / 5.69751221 - 1)).toBeLessThan(0.01)
  })

  it('matches both sides of every seam within 1 mm', () => {
    expect(worstMismatch(narrow)).toBeLessThan(0.001)
    expect(worstMismatch(wide)).toBeLessThan(0.001)
  })
})

describe('the demo sail (examples/hypar-sail.json, solved here) in strips of the roll', () => {
  const frame = parseFrameJson({
    ...JSON.parse(readFileSync('examples/hypar-sail.json', 'utf8')),
    mesh: { edgeLength: 0.35 },
  })
  const solved = solveFrame(frame)
  const surface: TriangleMesh = {
    vertices: new Float64Array(solved.vertices.flat()),
    triangles: new Uint32Array(solved.triangles.flat()),
  }
  const cuts = JSON.parse(readFileSync('examples/hypar-sail-cuts.json', 'utf8')) as CutSettings
  const { result } = computePattern(surface, { ...cuts, compensation: { warp: 0, fill: 0 } })

  it('flattens six strips with small mismatch and area kept', () => {
    expect(result.strips).toHaveLength(6)
    expect(worstMismatch(result)).toBeLessThan(0.001)
    for (const s of result.strips) expect(Math.abs(s.areaFlat / s.area3d - 1)).toBeLessThan(0.01)
    expect(result.strips.some((s) => s.overWidth)).toBe(false)
  })
})

describe('geodesic seam', () => {
  // a barrel vault (R = 2, 180°, 48 facets, 6 m long): geodesics are helices, straight when developed
  const R = 2
  const vault = structuredMesh(24, 48, (s, t) => {
    const th = Math.PI * (t - 0.5)
    return [6 * s, R * Math.sin(th), R * Math.cos(th)]
  })
  const point = (x: number, deg: number): [number, number, number] => [
    x,
    R * Math.sin((deg * Math.PI) / 180),
    R * Math.cos((deg * Math.PI) / 180),
  ]

  it('runs straight in the development: its length is the developed diagonal', () => {
    const { result } = computePattern(vault, {
      warpAngle: 0,
      compensation: { warp: 0, fill: 0 },
      seamAllowance: 0,
      rollWidth: 10,
      seams: [{ kind: 'geodesic', from: point(0, -60), to: point(6, 60) }],
    })
    expect(result.strips).toHaveLength(2)
    // developed: 6 m along the rulings by 32 facet chords round the arc (−60°…60° of 3.75° facets)
    const across = 32 * 2 * R * Math.sin(Math.PI / 96)
    const seam = result.strips[0]!.seams[0]!
    expect(seam.length3d).toBeCloseTo(Math.hypot(6, across), 3)
    expect(Math.abs(seam.mismatch)).toBeLessThan(1e-6)
    // both pieces are developable: no strain
    for (const s of result.strips) expect(Math.max(s.strain.maxWarp, s.strain.maxFill)).toBeLessThan(1e-6)
  })
})
