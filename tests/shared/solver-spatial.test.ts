import { describe, expect, it } from 'vitest'
import { cornerCotanWeights } from '../../shared/solver/cotan-laplacian'
import { solveSpatial } from '../../shared/solver/spatial'
import { rimMask, structuredMesh } from '../helpers/meshes'

const noCables = {
  cableSegments: new Uint32Array(),
  cableTensions: new Float64Array(),
}

/** Two coaxial rings of radius 1 a gap `gap` apart, centred at (3, −1, 2): a lofted cylinder start. */
function rings(gap: number, nu: number, nv: number) {
  const mesh = structuredMesh(
    nu,
    nv,
    (s, t) => [3 + Math.cos(2 * Math.PI * s), -1 + Math.sin(2 * Math.PI * s), 2 + gap * t],
    true,
  )
  return {
    vertices: mesh.vertices,
    triangles: mesh.triangles,
    isFixed: rimMask(mesh),
    ...noCables,
    prestress: 3,
  }
}

function surfaceArea(vertices: Float64Array, triangles: Uint32Array): number {
  const areas = new Float64Array(triangles.length / 3)
  cornerCotanWeights(new Float64Array(triangles.length), areas, vertices, triangles)
  return areas.reduce((a, b) => a + b, 0)
}

describe('spatial path (surface stress density)', () => {
  it('finds the stable catenoid between two rings R = h = 1', () => {
    // source: Euler (1744): R = c·cosh(h/2c), stable root c = 0.848337938, A = πc(h + c·sinh(h/c))
    // = 5.99179698 (CHECKS.md). Measured here at h = 2π/64 (angular step): area error −0.252·h²,
    // neck error −0.042·h², both dividing by 4 per halving; tolerances 1.5× that.
    const problem = rings(1, 64, 20)
    const result = solveSpatial(problem)
    expect(result.report.converged).toBe(true)
    expect(result.report.residual).toBeLessThan(1e-10)
    const h = (2 * Math.PI) / 64
    expect(Math.abs(surfaceArea(result.vertices, problem.triangles) - 5.99179698)).toBeLessThan(0.38 * h * h)
    let neck = Infinity
    for (let v = 0; v < result.vertices.length / 3; v++) {
      neck = Math.min(neck, Math.hypot(result.vertices[3 * v]! - 3, result.vertices[3 * v + 1]! + 1))
    }
    expect(Math.abs(neck - 0.848337938)).toBeLessThan(0.063 * h * h)
    // the unstable branch (area 6.84565539) is not where it settled
    expect(surfaceArea(result.vertices, problem.triangles)).toBeLessThan(6.5)
  })

  it('reports no-equilibrium beyond the largest gap (h/R > 1.32548684)', () => {
    // source: t·tanh t = 1 gives h_max/R = 1.32548684 (OEIS A253545, CHECKS.md); beyond it the
    // film splits into two discs, so no catenoid exists
    const result = solveSpatial(rings(1.45, 48, 16))
    expect(result.report.converged).toBe(false)
    expect(result.report.reason).toBe('no-equilibrium')
  })

  it('still settles just inside the gap limit (h/R = 1.25)', () => {
    // source: same relation; 1.25 < 1.3255 so a stable catenoid exists (its c from R = c·cosh(h/2c))
    const result = solveSpatial(rings(1.25, 48, 16))
    expect(result.report.converged).toBe(true)
  })

  it('bends a flexible edge cable into a circular arc of radius T/σ', () => {
    // source: cable under uniform normal load, T = w·R (standard in tensile-structure design
    // guides; CHECKS.md): T = 50 kN, σ = 2 kN/m, chord 10 m → r = 25 m, sag 0.505102572 m.
    // Measured error −1.0e-4·h² (h = 0.25 m): the tolerance 1e-5 m is about 1.5× that.
    const m = 40
    const mesh = structuredMesh(m, m, (s, t) => [10 * s - 4, 10 * t + 7, 1.5])
    const isFixed = rimMask(mesh)
    const segments: number[] = []
    for (let i = 0; i < m; i++) segments.push(i, i + 1)
    for (let i = 1; i < m; i++) isFixed[i] = 0 // the lattice row t = 0 is the cable
    const result = solveSpatial({
      vertices: mesh.vertices,
      triangles: mesh.triangles,
      isFixed,
      cableSegments: Uint32Array.from(segments),
      cableTensions: new Float64Array(m).fill(50),
      prestress: 2,
    })
    expect(result.report.converged).toBe(true)
    const sag = result.vertices[3 * (m / 2) + 1]! - 7
    expect(Math.abs(sag - 0.505102572)).toBeLessThan(1e-5)
    // a flat membrane stays flat
    for (let v = 0; v < result.vertices.length / 3; v++) expect(result.vertices[3 * v + 2]).toBeCloseTo(1.5, 12)
    // every cable node lies on the circle of radius 25 m through the anchors (x = −4 and 6, y = 7),
    // whose centre lies away from the membrane, at y = 7 − √(25² − 5²)
    const centreY = 7 - Math.sqrt(25 * 25 - 5 * 5)
    for (let i = 1; i < m; i++) {
      const r = Math.hypot(result.vertices[3 * i]! - 1, result.vertices[3 * i + 1]! - centreY)
      expect(Math.abs(r - 25)).toBeLessThan(1e-4)
    }
  })

  it('stops with cancelled when the signal is aborted', () => {
    const signal = { aborted: false }
    const result = solveSpatial(rings(1, 32, 10), {
      signal,
      onProgress: (i) => {
        if (i === 3) signal.aborted = true
      },
    })
    expect(result.report.reason).toBe('cancelled')
    expect(result.report.iterations).toBe(3)
  })
})
