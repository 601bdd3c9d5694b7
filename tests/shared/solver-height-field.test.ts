import { describe, expect, it } from 'vitest'
import { heightFieldArea, planElements } from '../../shared/solver/area-functional'
import { solveHeightField } from '../../shared/solver/height-field'
import type { MembraneMesh } from '../../shared/types'
import { annulusMesh, discMesh, maxDifference, placed, rimMask, structuredMesh } from '../helpers/meshes'

/** Solves on a test mesh whose z holds the exact surface (boundary heights are taken from it). */
function solve(mesh: MembraneMesh) {
  const result = solveHeightField({
    vertices: mesh.vertices,
    triangles: mesh.triangles,
    isFixed: rimMask(mesh),
  })
  expect(result.report.converged).toBe(true)
  expect(result.report.residual).toBeLessThan(1e-10)
  const area = heightFieldArea(planElements(mesh.vertices, mesh.triangles), result.heights)
  const exact = Float64Array.from({ length: result.heights.length }, (_, v) => mesh.vertices[3 * v + 2]!)
  return {
    area,
    heights: result.heights,
    nodalError: maxDifference(result.heights, exact),
    report: result.report,
  }
}

/** Scherk's first surface u = ln(cos y / cos x) on [−a, a]², rotated by 0.3 rad and moved to (5, −2). */
function scherk(a: number, m: number): MembraneMesh {
  const toPlan = placed(0.3, 5, -2)
  return structuredMesh(m, m, (s, t) => {
    const x = -a + 2 * a * s,
      y = -a + 2 * a * t
    return [...toPlan(x, y), Math.log(Math.cos(y) / Math.cos(x))]
  })
}

describe('height-field minimal surfaces against exact solutions', () => {
  it("Scherk's surface over [−1,1]², placed off the origin and rotated", () => {
    // source: H. F. Scherk, 1835 — area over [−1,1]² = 5.69751221, u(0.5, 0.25) = 0.0990031892
    // (CHECKS.md). Linear elements: area error ≈ −0.40·h², nodal error ≤ 0.016·h² (measured here,
    // CHECKS.md); h = 1/16, so both tolerances are about 1.5× the expected error.
    const m = 32
    const h = 2 / m
    const { area, heights, nodalError } = solve(scherk(1, m))
    expect(Math.abs(area - 5.69751221)).toBeLessThan(0.6 * h * h)
    expect(nodalError).toBeLessThan(0.025 * h * h)
    // vertex (i, j) = (24, 20) sits at (x, y) = (0.5, 0.25)
    expect(Math.abs(heights[20 * (m + 1) + 24]! - 0.0990031892)).toBeLessThan(0.025 * h * h)
  })

  it("Scherk's surface over [−1.2,1.2]² (steeper: slopes up to 2.6)", () => {
    // source: Scherk (1835), area 9.94982500 (CHECKS.md); error still O(h²), larger constant near
    // the steep corners (measured −0.71·h²); tolerance 1.0·h² at h = 2.4/48
    const m = 48
    const h = 2.4 / m
    const { area } = solve(scherk(1.2, m))
    expect(Math.abs(area - 9.949825)).toBeLessThan(1.0 * h * h)
  })

  it('half-catenoid over an annulus (a frame with a hole)', () => {
    // source: Euler's catenoid (1744), u = c·arccosh(r/c), c = 1, 1.5 ≤ r ≤ 3: area 23.9029771,
    // u(2) = 1.31695790 (CHECKS.md). Chords replace the circles: domain error O(h²) too. Measured
    // here: area −0.59·h², nodal 0.008·h²; tolerances 1.5× that.
    const nr = 24
    const h = 1.5 / nr
    const mesh = annulusMesh(1.5, 3, nr, (r) => Math.acosh(r))
    const { area, heights, nodalError } = solve(mesh)
    expect(Math.abs(area - 23.9029771)).toBeLessThan(0.9 * h * h)
    expect(nodalError).toBeLessThan(0.012 * h * h)
    const cols = heights.length / (nr + 1)
    // ring j = 16 of 24 has r = 3 − 1.5·16/24 = 2
    expect(Math.abs(heights[16 * cols + 5]! - 1.3169579)).toBeLessThan(0.012 * h * h)
  })

  it('helicoid over an annular sector', () => {
    // source: Meusnier (1776), u = kθ, k = 1, α = π/2, 0.5 ≤ r ≤ 2: area 3.82924221 (CHECKS.md).
    // Measured: area −0.36·h²; on this polar lattice the nodal values of θ came out exact to
    // rounding (2e-12·h²), so nodes are held to 1e-9.
    const m = 32
    const h = 1.5 / m
    const toPlan = placed(-1.1, -3, 7)
    const mesh = structuredMesh(m, m, (s, t) => {
      const r = 0.5 + 1.5 * t,
        th = (Math.PI / 2) * s
      return [...toPlan(r * Math.cos(th), r * Math.sin(th)), th]
    })
    const { area, nodalError } = solve(mesh)
    expect(Math.abs(area - 3.82924221)).toBeLessThan(0.55 * h * h)
    expect(nodalError).toBeLessThan(1e-9)
  })

  it("Enneper's surface over |w| ≤ 0.5 (a height field for ρ < 1)", () => {
    // source: A. Enneper (1864), A = π((1+ρ²)³ − 1)/3 = 0.998110166 at ρ = 0.5 (CHECKS.md); nodes are
    // images of w, so the exact height u² − v² is known at every vertex. Measured: area −0.50·h²,
    // nodal 0.0068·h² (h = ρ/16 in w); tolerances 1.5× that.
    const m = 32
    const rho = 0.5
    const mesh = discMesh(m, (a, b) => {
      const u = rho * a,
        v = rho * b
      return [u - u ** 3 / 3 + u * v * v, -v + v ** 3 / 3 - u * u * v, u * u - v * v]
    })
    const h = (2 * rho) / m
    const { area, nodalError } = solve(mesh)
    expect(Math.abs(area - 0.998110166)).toBeLessThan(0.75 * h * h)
    expect(nodalError).toBeLessThan(0.012 * h * h)
  })
})

describe('height-field asymptotics', () => {
  it('converges O(h²): halving h divides the largest nodal error by about 4', () => {
    // source: Rannacher, RAIRO Anal. Numér. 11 (1977); Johnson & Thomée, Math. Comp. 29 (1975),
    // cited from memory (CHECKS.md)
    const coarse = solve(scherk(1, 16)).nodalError
    const fine = solve(scherk(1, 32)).nodalError
    expect(coarse / fine).toBeGreaterThan(3.5)
    expect(coarse / fine).toBeLessThan(4.5)
  })

  it('small slopes: the minimal surface approaches the harmonic one like ε³', () => {
    // source: linearisation of the minimal surface equation, nonlinear terms cubic in ε (derived;
    // common practice, CHECKS.md). Compared on one mesh: discrete minimal vs discrete Laplace.
    const gap = (eps: number): number => {
      const mesh = structuredMesh(24, 24, (s, t) => {
        const x = 2 * s - 1,
          y = 2 * t - 1
        return [x + 3, y, eps * (x * x - y * y + 0.5 * x * y * y)]
      })
      const problem = {
        vertices: mesh.vertices,
        triangles: mesh.triangles,
        isFixed: rimMask(mesh),
      }
      const laplace = solveHeightField(problem, {
        maxIterations: 1,
        tolerance: Infinity,
      }).heights
      const minimal = solveHeightField(problem).heights
      return maxDifference(minimal, laplace)
    }
    const ratio = gap(0.1) / gap(0.05)
    expect(ratio).toBeGreaterThan(7.5)
    expect(ratio).toBeLessThan(8.5)
  })
})
