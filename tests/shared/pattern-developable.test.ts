/**
 * Flat patterns of developable strips: CHECKS.md "developable strips" and "compensation".
 * A strip of a cylinder or a cone triangulated between its rulings is exactly developable
 * (developable surfaces, common geometry): flattened, every edge keeps its length, strain is zero,
 * the cylinder strip is a rectangle and the cone strip an annular sector of angle Δθ·sin α.
 */
import { describe, expect, it } from 'vitest'
import { computePattern, type CutSettings, type PlaneSeam } from '../../shared/pattern'
import { structuredMesh } from '../helpers/meshes'

const R = 2
const LENGTH = 6
/** Barrel vault along +x: 48 facets over 180°, so 45° is 12 facets; rows split along the length. */
const vault = structuredMesh(6, 48, (s, t) => {
  const th = Math.PI * (t - 0.5)
  return [LENGTH * s + 3, R * Math.sin(th) - 1, R * Math.cos(th) + 0.5]
})
/** The plane through the axis at angle θ (degrees) from the top: it holds one ruling. */
const axial = (deg: number): PlaneSeam => {
  const th = (deg * Math.PI) / 180
  return { kind: 'plane', point: [0, -1, 0.5], normal: [0, Math.cos(th), -Math.sin(th)] }
}
const settings = (extra: Partial<CutSettings> = {}): CutSettings => ({
  warpAngle: 0,
  compensation: { warp: 0, fill: 0 },
  seamAllowance: 0,
  rollWidth: 2.5,
  seams: [axial(0), axial(45)],
  ...extra,
})
/** Faceted width of a 45° strip: 12 chords of 3.75° (CHECKS.md: 1.5702 to four places… as chords). */
const chordSum = 12 * 2 * R * Math.sin(Math.PI / 96)

function edgeErrors(flat: { uv: Float64Array; positions: Float64Array; triangles: Uint32Array }): number {
  let worst = 0
  const { uv, positions: p, triangles } = flat
  for (let t = 0; t < triangles.length; t += 3) {
    for (let k = 0; k < 3; k++) {
      const a = triangles[t + k]!,
        b = triangles[t + ((k + 1) % 3)]!
      const l3 = Math.hypot(p[3 * b]! - p[3 * a]!, p[3 * b + 1]! - p[3 * a + 1]!, p[3 * b + 2]! - p[3 * a + 2]!)
      const l2 = Math.hypot(uv[2 * b]! - uv[2 * a]!, uv[2 * b + 1]! - uv[2 * a + 1]!)
      worst = Math.max(worst, Math.abs(l2 / l3 - 1))
    }
  }
  return worst
}

const box = (points: [number, number][]) => {
  const us = points.map((p) => p[0]),
    vs = points.map((p) => p[1])
  return {
    du: Math.max(...us) - Math.min(...us),
    dv: Math.max(...vs) - Math.min(...vs),
    u0: Math.min(...us),
    v0: Math.min(...vs),
  }
}

describe('cylinder strip between rulings (developable: a rectangle)', () => {
  const { result, detail } = computePattern(vault, settings())
  const middle = result.strips.findIndex((s) => Math.abs(s.area3d - LENGTH * chordSum) < 1e-9)

  it('cuts three strips and finds the 45° one', () => {
    expect(result.strips).toHaveLength(3)
    expect(middle).toBeGreaterThanOrEqual(0)
  })

  it('keeps every edge length (≤ 1e-9 relative) and has zero strain', () => {
    for (const flat of detail.flat) expect(edgeErrors(flat)).toBeLessThan(1e-9)
    for (const s of result.strips) {
      expect(s.strain.maxWarp).toBeLessThan(1e-9)
      expect(s.strain.maxFill).toBeLessThan(1e-9)
      expect(s.strain.rms).toBeLessThan(1e-9)
    }
  })

  it('lays the 45° strip out as a 6 × chord-sum rectangle with the warp (the rulings) along u', () => {
    const s = result.strips[middle]!
    const b = box(s.outline)
    expect(b.du).toBeCloseTo(LENGTH, 9)
    expect(b.dv).toBeCloseTo(chordSum, 9)
    expect(s.areaFlat).toBeCloseTo(LENGTH * chordSum, 9)
    // every outline point lies on the rectangle's border
    for (const [u, v] of s.outline) {
      const onBorder = Math.min(
        Math.abs(u - b.u0),
        Math.abs(u - b.u0 - b.du),
        Math.abs(v - b.v0),
        Math.abs(v - b.v0 - b.dv),
      )
      expect(onBorder).toBeLessThan(1e-9)
    }
    // both seams (the rulings) keep their 6 m on each side
    for (const seam of s.seams) {
      expect(seam.length3d).toBeCloseTo(LENGTH, 12)
      expect(Math.abs(seam.mismatch)).toBeLessThan(1e-9)
    }
  })

  it('compensates exactly: warp 2 %, fill 1 % gives 5.88 × 0.99·chord-sum (CHECKS.md "compensation")', () => {
    const s = computePattern(vault, settings({ compensation: { warp: 2, fill: 1 } })).result.strips[middle]!
    const b = box(s.outline)
    expect(b.du).toBeCloseTo(5.88, 9)
    expect(b.dv).toBeCloseTo(0.99 * chordSum, 9)
    expect(s.areaFlat).toBeCloseTo(0.98 * 0.99 * LENGTH * chordSum, 9)
  })

  it('turns the strip when the warp runs round the vault (warp angle 90°): compensation follows the warp', () => {
    const s = computePattern(vault, settings({ warpAngle: 90, compensation: { warp: 2, fill: 1 } })).result.strips[
      middle
    ]!
    const b = box(s.outline)
    expect(b.du).toBeCloseTo(0.98 * chordSum, 9)
    expect(b.dv).toBeCloseTo(0.99 * LENGTH, 9)
  })

  it('adds the seam allowance along seams only (the vault ends are frame edges)', () => {
    const s = computePattern(vault, settings({ seamAllowance: 0.05, rollWidth: 1.6 })).result.strips[middle]!
    expect(s.length).toBeCloseTo(LENGTH, 9)
    expect(s.width).toBeCloseTo(chordSum + 0.1, 9)
    expect(s.overWidth).toBe(true)
  })
})

describe('cone strip (developable: an annular sector of angle Δθ·sin α)', () => {
  const alpha = (50 * Math.PI) / 180
  const n = 96 // facets round the whole cone; the strip takes 12 of them (Δθ = 45°)
  const cone = structuredMesh(
    n,
    5,
    (s, t) => {
      const rho = 1 + 3 * t,
        th = 2 * Math.PI * s
      return [
        rho * Math.sin(alpha) * Math.cos(th) + 4,
        rho * Math.sin(alpha) * Math.sin(th) - 2,
        7 - rho * Math.cos(alpha),
      ]
    },
    true,
  )
  const radial = (deg: number): PlaneSeam => {
    const th = (deg * Math.PI) / 180
    return { kind: 'plane', point: [4, -2, 0], normal: [-Math.sin(th), Math.cos(th), 0] }
  }
  const { result, detail } = computePattern(cone, settings({ seams: [radial(0), radial(45)], warpCentre: [4, -2] }))

  it('keeps every edge length and opens the 45° strip to the developed angle', () => {
    // a vertical plane through the axis cuts both sides: 0–45°, 45–180°, 180–225°, 225–360°
    expect(result.strips).toHaveLength(4)
    for (const flat of detail.flat) expect(edgeErrors(flat)).toBeLessThan(1e-9)
    // strips are counted counter-clockwise round the warp centre from +x: S1 is 0–45°
    const k = 0
    expect(result.strips[k]!.area3d).toBeCloseTo(cone3dArea(alpha, Math.PI / 4), 2)
    const flat = detail.flat[k]!
    // the four corners: inner and outer ends of the two cut rulings (θ = 0 and θ = 45°)
    const corner = (rho: number, deg: number) => {
      const th = (deg * Math.PI) / 180
      const want = [
        rho * Math.sin(alpha) * Math.cos(th) + 4,
        rho * Math.sin(alpha) * Math.sin(th) - 2,
        7 - rho * Math.cos(alpha),
      ]
      let best = 0,
        bestD = Infinity
      for (let v = 0; v < flat.positions.length / 3; v++) {
        const d = Math.hypot(
          flat.positions[3 * v]! - want[0]!,
          flat.positions[3 * v + 1]! - want[1]!,
          flat.positions[3 * v + 2]! - want[2]!,
        )
        if (d < bestD) [best, bestD] = [v, d]
      }
      return [flat.uv[2 * best]!, flat.uv[2 * best + 1]!] as const
    }
    const a0 = corner(1, 0),
      b0 = corner(4, 0),
      a1 = corner(1, 45),
      b1 = corner(4, 45)
    const angle = Math.abs(
      Math.atan2(
        (b0[0] - a0[0]) * (b1[1] - a1[1]) - (b0[1] - a0[1]) * (b1[0] - a1[0]),
        (b0[0] - a0[0]) * (b1[0] - a1[0]) + (b0[1] - a0[1]) * (b1[1] - a1[1]),
      ),
    )
    // faceted exactly: 12 facets, each opening 2·asin(sin α·sin(δ/2)) with δ = 2π/96
    const faceted = 12 * 2 * Math.asin(Math.sin(alpha) * Math.sin(Math.PI / n))
    expect(angle).toBeCloseTo(faceted, 9)
    // smooth cone: Δθ·sin α, the faceting error is O(δ²)
    expect(Math.abs(angle / ((Math.PI / 4) * Math.sin(alpha)) - 1)).toBeLessThan(1e-3)
  })
})

/** Area of a cone strip of slant radii 1…4 and plan angle Δθ: ½Δθ sin α (4² − 1²), faceted slightly less. */
function cone3dArea(alpha: number, dTheta: number): number {
  return 0.5 * dTheta * Math.sin(alpha) * 15 * (1 - (Math.PI / 96) ** 2 / 6)
}
