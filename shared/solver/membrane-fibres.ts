/**
 * Warp/fill prestress as the spatial solve uses it: an isotropic part min(warp, fill) and fibres
 * along the stronger direction (see membrane-energy.ts), laid out on a reference surface — the
 * plan mesh for plan-meshed frames (the warp direction in plan, projected vertically onto the
 * surface, as PRODUCT.md defines it), the start loft for rings one above the other.
 */
import type { MembraneStress } from './membrane-energy'
import { fibreVector } from './membrane-energy'
import { planDirectionRise } from '../mesh/quantities'

/** Cables as loads on the membrane's boundary. */
export interface CableLoad {
  /** #S×2 Uint32Array: vertex pairs. */
  segments: Uint32Array
  /** #S Float64Array: tension T, kN. */
  tensions: Float64Array
}

export interface WarpFibres {
  /** c = |warp − fill|, kN/m. */
  coefficient: number
  /** #T×3 Float64Array, γ_Tk = A_ref·∇φ_k·â (m): the fibre vector of triangle T is Σ_k γ_Tk x_k. */
  weights: Float64Array
}

/** Prestress as given in the frame (kN/m, kN/m, degrees from +x in plan). */
export interface WarpFillPrestress {
  warp: number
  fill: number
  warpAngle: number
}

/**
 * The energy's prestress for `prestress` on `reference` (#V×3, m; z is ignored when plan is true).
 * The fibre direction â on each reference triangle is the plan direction projected vertically onto
 * its plane, or orthogonally where the triangle stands (nearly) vertical.
 */
export function membraneStress(
  prestress: Readonly<WarpFillPrestress>,
  reference: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  plan: boolean,
): MembraneStress {
  const { warp, fill } = prestress
  if (warp === fill) return { isotropic: warp }
  const angle = ((prestress.warpAngle + (warp > fill ? 0 : 90)) * Math.PI) / 180
  const ax = Math.cos(angle),
    ay = Math.sin(angle)
  const weights = new Float64Array(triangles.length)
  const z = (p: number) => (plan ? 0 : reference[p + 2]!)
  for (let t = 0; t < triangles.length; t += 3) {
    const c: [number, number, number] = [3 * triangles[t]!, 3 * triangles[t + 1]!, 3 * triangles[t + 2]!]
    const ux = reference[c[1]]! - reference[c[0]]!,
      uy = reference[c[1] + 1]! - reference[c[0] + 1]!,
      uz = z(c[1]) - z(c[0])
    const vx = reference[c[2]]! - reference[c[0]]!,
      vy = reference[c[2] + 1]! - reference[c[0] + 1]!,
      vz = z(c[2]) - z(c[0])
    let nx = uy * vz - uz * vy,
      ny = uz * vx - ux * vz,
      nz = ux * vy - uy * vx
    const twice = Math.hypot(nx, ny, nz)
    if (twice === 0) continue
    nx /= twice
    ny /= twice
    nz /= twice
    // vertical projection keeps the plan direction; a standing triangle takes the orthogonal one
    let dx = ax,
      dy = ay,
      dz = Math.abs(nz) > 0.1 ? planDirectionRise(nx, ny, nz, ax, ay) : 0
    if (dz === 0 && Math.abs(nz) <= 0.1) {
      const along = nx * ax + ny * ay
      dx -= along * nx
      dy -= along * ny
      dz -= along * nz
    }
    const length = Math.hypot(dx, dy, dz)
    if (length < 1e-6) continue
    for (let k = 0; k < 3; k++) {
      const p = c[(k + 1) % 3]!,
        q = c[(k + 2) % 3]!
      const ex = reference[p]! - reference[q]!,
        ey = reference[p + 1]! - reference[q + 1]!,
        ez = z(p) - z(q)
      // A·∇φ_k = ½ E_k × n̂, dotted with â
      const gx = ey * nz - ez * ny,
        gy = ez * nx - ex * nz,
        gz = ex * ny - ey * nx
      weights[t + k] = (gx * dx + gy * dy + gz * dz) / (2 * length)
    }
  }
  return { isotropic: Math.min(warp, fill), fibres: { coefficient: Math.abs(warp - fill), weights } }
}

/** How far the settled stresses are from the prescribed ones, % of the larger prestress. */
export interface StressDeviation {
  /** Largest over faces. */
  max: number
  /** Root mean square over the surface, area-weighted. */
  rms: number
}

/**
 * Stress along the fibre direction on the solved surface, σ_iso + c·|w|/A (A the face's area now),
 * against the prescribed max(warp, fill); across it the stress is σ_iso exactly. Zero when warp =
 * fill. x: #V×3, m.
 */
export function stressDeviation(
  x: Readonly<Float64Array>,
  triangles: Readonly<Uint32Array>,
  stress: Readonly<MembraneStress>,
): StressDeviation {
  const fibres = stress.fibres
  if (!fibres) return { max: 0, rms: 0 }
  const prescribed = stress.isotropic + fibres.coefficient
  const w = new Float64Array(3)
  let max = 0,
    sum = 0,
    total = 0
  for (let t = 0; t < triangles.length; t += 3) {
    const a = 3 * triangles[t]!,
      b = 3 * triangles[t + 1]!,
      c = 3 * triangles[t + 2]!
    const ux = x[b]! - x[a]!,
      uy = x[b + 1]! - x[a + 1]!,
      uz = x[b + 2]! - x[a + 2]!
    const vx = x[c]! - x[a]!,
      vy = x[c + 1]! - x[a + 1]!,
      vz = x[c + 2]! - x[a + 2]!
    const area = Math.hypot(uy * vz - uz * vy, uz * vx - ux * vz, ux * vy - uy * vx) / 2
    if (area === 0) continue
    const settled = stress.isotropic + (fibres.coefficient * fibreVector(fibres.weights, x, triangles, t, w)) / area
    const deviation = (100 * Math.abs(settled - prescribed)) / prescribed
    max = Math.max(max, deviation)
    sum += area * deviation * deviation
    total += area
  }
  return { max, rms: total > 0 ? Math.sqrt(sum / total) : 0 }
}
