import { describe, expect, it } from 'vitest'
import { cornerCotanWeights } from '../../shared/solver/cotan-laplacian'
import { membraneEnergy, membraneGradient, type MembraneStress } from '../../shared/solver/membrane-energy'
import { membraneStress } from '../../shared/solver/membrane-fibres'
import { assembleProjectedHessian } from '../../shared/solver/membrane-hessian'
import { spatialSetup, type SpatialProblem } from '../../shared/solver/spatial'
import { fillBasis, vertexNormals } from '../../shared/solver/spatial-directions'
import { solveSpatialNewton } from '../../shared/solver/spatial-newton'
import { solveSpatialPath } from '../../shared/solver/spatial-path'
import type { MembraneMesh } from '../../shared/types'
import { placed, rimMask, structuredMesh } from '../helpers/meshes'

const noCables = { cableSegments: new Uint32Array(), cableTensions: new Float64Array() }

function surfaceArea(vertices: Float64Array, triangles: Uint32Array): number {
  const areas = new Float64Array(triangles.length / 3)
  cornerCotanWeights(new Float64Array(triangles.length), areas, vertices, triangles)
  return areas.reduce((a, b) => a + b, 0)
}

/**
 * The spatial Newton solve on a test mesh with rigid rim: cold (from the harmonic map of the rim on
 * the plan, the small-slope start the engine uses) or from the mesh's own interior heights.
 */
function newtonOnRim(mesh: MembraneMesh, stress: MembraneStress = { isotropic: 3 }, coldStart = true) {
  const isFixed = rimMask(mesh)
  const vertices = Float64Array.from(mesh.vertices)
  const metric = Float64Array.from(mesh.vertices, (c, i) => (i % 3 === 2 ? 0 : c))
  const problem = { vertices, triangles: mesh.triangles, isFixed, ...noCables, prestress: 3, stress, metric, coldStart }
  const result = solveSpatialNewton(problem)
  expect(result.report).toMatchObject({ converged: true })
  expect(result.report.residual).toBeLessThan(1e-10)
  return { ...result, isFixed, area: surfaceArea(result.vertices, mesh.triangles) }
}

/** Largest |z − u(x, y)| over free vertices at their settled plan positions. */
function nodalError(x: Float64Array, isFixed: Uint8Array, u: (px: number, py: number) => number): number {
  let worst = 0
  for (let v = 0; v < isFixed.length; v++) {
    if (isFixed[v]) continue
    worst = Math.max(worst, Math.abs(x[3 * v + 2]! - u(x[3 * v]!, x[3 * v + 1]!)))
  }
  return worst
}

/** Scherk's first surface on [−a, a]², rotated by 0.3 rad and moved to (5, −2); u in frame coordinates. */
function scherk(a: number, m: number) {
  const toPlan = placed(0.3, 5, -2)
  const toLocal = (px: number, py: number): [number, number] => {
    const dx = px - 5,
      dy = py + 2
    return [Math.cos(0.3) * dx + Math.sin(0.3) * dy, -Math.sin(0.3) * dx + Math.cos(0.3) * dy]
  }
  const mesh = structuredMesh(m, m, (s, t) => {
    const x = -a + 2 * a * s,
      y = -a + 2 * a * t
    return [...toPlan(x, y), Math.log(Math.cos(y) / Math.cos(x))]
  })
  const u = (px: number, py: number) => {
    const [x, y] = toLocal(px, py)
    return Math.log(Math.cos(y) / Math.cos(x))
  }
  return { mesh, u }
}

describe('second-order spatial solve: exact derivatives', () => {
  it('the projected Hessian matches finite differences of the projected gradient (area, fibres, cables)', () => {
    // source: definition of the derivative (central differences, error O(ε²))
    const mesh = structuredMesh(4, 3, (s, t) => [
      3 * s + 0.2 * Math.sin(7 * t),
      2 * t + 0.1 * s * s,
      0.7 * s * t - 0.3 * t * t,
    ])
    const isFixed = rimMask(mesh)
    const segments = [0, 1, 1, 2, 2, 3, 3, 4]
    for (const v of [1, 2, 3]) isFixed[v] = 0
    const problem: SpatialProblem = {
      vertices: mesh.vertices,
      triangles: mesh.triangles,
      isFixed,
      cableSegments: Uint32Array.from(segments),
      cableTensions: Float64Array.from([5, 5, 5, 5]),
      prestress: 2,
    }
    const stress = membraneStress({ warp: 3, fill: 1.2, warpAngle: 25 }, mesh.vertices, mesh.triangles, true)
    const cables = { segments: problem.cableSegments, tensions: problem.cableTensions }
    const setup = spatialSetup(problem)
    const dofs = setup.system.pattern
    const normals = new Float64Array(mesh.vertices.length)
    vertexNormals(normals, mesh.vertices, mesh.triangles)
    const basis = new Float64Array(3 * dofs.matrix.n)
    fillBasis(basis, dofs, setup.freeVertices, normals, setup.cableNeighbours, mesh.vertices)
    const layout = { vertexPattern: setup.vertexPattern, dofs, segmentSlots: setup.segmentSlots }
    assembleProjectedHessian(layout, basis, mesh.vertices, mesh.triangles, stress, cables)
    const projected = (x: Float64Array) => {
      const g = membraneGradient(
        new Float64Array(x.length),
        new Float64Array(mesh.triangles.length / 3),
        x,
        mesh.triangles,
        stress,
        cables,
      )
      const out = new Float64Array(dofs.matrix.n)
      for (let row = 0; row < setup.freeVertices.length; row++) {
        const v = setup.freeVertices[row]!
        for (let a = dofs.dofStart[row]!; a < dofs.dofStart[row + 1]!; a++)
          for (let d = 0; d < 3; d++) out[a]! += basis[3 * a + d]! * g[3 * v + d]!
      }
      return out
    }
    const eps = 1e-6
    const rowOf = (a: number) => {
      let row = 0
      while (dofs.dofStart[row + 1]! <= a) row++
      return row
    }
    let worst = 0
    for (let b = 0; b < dofs.matrix.n; b++) {
      const v = setup.freeVertices[rowOf(b)]!
      const plus = Float64Array.from(mesh.vertices),
        minus = Float64Array.from(mesh.vertices)
      for (let d = 0; d < 3; d++) {
        plus[3 * v + d]! += eps * basis[3 * b + d]!
        minus[3 * v + d]! -= eps * basis[3 * b + d]!
      }
      const gp = projected(plus),
        gm = projected(minus)
      for (let a = 0; a < dofs.matrix.n; a++) {
        const fd = (gp[a]! - gm[a]!) / (2 * eps)
        let exact = 0
        const { rowStart, columns, values } = dofs.matrix
        for (let p = rowStart[a]!; p < rowStart[a + 1]!; p++) if (columns[p] === b) exact = values[p]!
        worst = Math.max(worst, Math.abs(fd - exact))
      }
    }
    expect(worst).toBeLessThan(1e-6)
    // and the gradient is the energy's: a directional difference
    const g = membraneGradient(
      new Float64Array(mesh.vertices.length),
      new Float64Array(mesh.triangles.length / 3),
      mesh.vertices,
      mesh.triangles,
      stress,
      cables,
    )
    const dir = Float64Array.from(mesh.vertices, (_, i) => Math.sin(3 * i))
    const shifted = (s: number) => Float64Array.from(mesh.vertices, (x, i) => x + s * dir[i]!)
    const fd =
      (membraneEnergy(shifted(eps), mesh.triangles, stress, cables) -
        membraneEnergy(shifted(-eps), mesh.triangles, stress, cables)) /
      (2 * eps)
    expect(Math.abs(fd - g.reduce((s, gi, i) => s + gi * dir[i]!, 0))).toBeLessThan(1e-6)
  })
})

describe('second-order spatial solve: exact minimal surfaces (forced onto the spatial path)', () => {
  it("Scherk's surface over [−1,1]², with O(h²) convergence of the nodal error", () => {
    // source: H. F. Scherk, 1835 — area over [−1,1]² = 5.69751221 (CHECKS.md); O(h²): Rannacher
    // (1977), Johnson & Thomée (1975), from memory (CHECKS.md). Nodal error at each vertex's settled
    // plan position (the spatial path slides vertices in the surface). Measured on this path: nodal
    // error 0.028·h² at h = 1/16, ratio 3.74 per halving, 8–9 Newton steps; tolerances about 1.5×.
    const coarse = scherk(1, 16)
    const fine = scherk(1, 32)
    const a = newtonOnRim(coarse.mesh)
    const b = newtonOnRim(fine.mesh)
    const h = 2 / 32
    expect(Math.abs(b.area - 5.69751221)).toBeLessThan(0.6 * h * h)
    const e1 = nodalError(a.vertices, a.isFixed, coarse.u)
    const e2 = nodalError(b.vertices, b.isFixed, fine.u)
    expect(e2).toBeLessThan(0.04 * h * h)
    expect(e1 / e2).toBeGreaterThan(3.3)
    expect(e1 / e2).toBeLessThan(4.7)
    expect(a.report.iterations).toBeLessThanOrEqual(15)
    expect(b.report.iterations).toBeLessThanOrEqual(15)
  })

  it('helicoid over an annular sector, started from a bumped surface', () => {
    // source: Meusnier (1776), u = kθ, k = 1, α = π/2, 0.5 ≤ r ≤ 2: area 3.82924221 (CHECKS.md).
    // θ is also harmonic, so the cold start would already be the answer: a bump of 0.2 m is added.
    const m = 24
    const h = 1.5 / m
    const toPlan = placed(-1.1, -3, 7)
    const mesh = structuredMesh(m, m, (s, t) => {
      const r = 0.5 + 1.5 * t,
        th = (Math.PI / 2) * s
      return [...toPlan(r * Math.cos(th), r * Math.sin(th)), th + 0.2 * Math.sin(Math.PI * s) * Math.sin(Math.PI * t)]
    })
    const result = newtonOnRim(mesh, { isotropic: 3 }, false)
    expect(result.report.iterations).toBeGreaterThan(2)
    expect(Math.abs(result.area - 3.82924221)).toBeLessThan(0.55 * h * h)
    const theta = (px: number, py: number) => Math.atan2(py - 7, px + 3) + 1.1
    expect(nodalError(result.vertices, result.isFixed, theta)).toBeLessThan(0.05 * h * h)
  })

  it('catenoid between two rings R = h = 1, and no equilibrium past the largest gap', () => {
    // source: Euler (1744): c = 0.848337938, A = 5.99179698; h_max/R = 1.32548684 (OEIS A253545)
    // (CHECKS.md). Tolerances as on the first-order path (measured −0.252·h², neck −0.042·h²).
    const rings = (gap: number, nu: number, nv: number) => {
      const mesh = structuredMesh(
        nu,
        nv,
        (s, t) => [3 + Math.cos(2 * Math.PI * s), -1 + Math.sin(2 * Math.PI * s), 2 + gap * t],
        true,
      )
      return { vertices: mesh.vertices, triangles: mesh.triangles, isFixed: rimMask(mesh), ...noCables, prestress: 3 }
    }
    const problem = rings(1, 64, 20)
    const result = solveSpatialPath(problem, { warp: 3, fill: 3, warpAngle: 0 }, problem.vertices, false, {})
    expect(result.report.converged).toBe(true)
    expect(result.report.method).toBe('newton-spatial')
    const h = (2 * Math.PI) / 64
    expect(Math.abs(surfaceArea(result.vertices, problem.triangles) - 5.99179698)).toBeLessThan(0.38 * h * h)
    let neck = Infinity
    for (let v = 0; v < result.vertices.length / 3; v++)
      neck = Math.min(neck, Math.hypot(result.vertices[3 * v]! - 3, result.vertices[3 * v + 1]! + 1))
    expect(Math.abs(neck - 0.848337938)).toBeLessThan(0.063 * h * h)
    const beyond = rings(1.45, 48, 16)
    const split = solveSpatialPath(beyond, { warp: 3, fill: 3, warpAngle: 0 }, beyond.vertices, false, {})
    expect(split.report.converged).toBe(false)
    expect(split.report.reason).toBe('no-equilibrium')
  })
})
