import { EPSILON } from '../linalg/constants'
import type { TrianglePattern } from '../linalg/triangle-pattern'

/**
 * The area of a height-field surface z = u(x, y) with linear finite elements:
 * Area(u) = ∑_T A_T √(1 + |∇u_T|²), A_T the plan area of triangle T and ∇u_T its constant gradient.
 * Minimisers solve the minimal surface equation; the Hessian is SPD on the free heights (the
 * integrand's Hessian in ∇u has eigenvalues 1/w and 1/w³, w = √(1 + |∇u|²)).
 */
export interface PlanElements {
  triangles: Uint32Array
  /** #T×7 Float64Array: plan area A (m²), then ∂φ_k/∂x for k = 0..2, then ∂φ_k/∂y (1/m). */
  data: Float64Array
  /** #V Float64Array: one third of the plan area of the adjacent triangles (m²). */
  vertexAreas: Float64Array
}

/** Plan areas and shape-function gradients. vertices: #V×3 (x, y used), triangles: #T×3. */
export function planElements(vertices: Readonly<Float64Array>, triangles: Readonly<Uint32Array>): PlanElements {
  const count = triangles.length / 3
  const data = new Float64Array(7 * count)
  const vertexAreas = new Float64Array(vertices.length / 3)
  let meanArea = 0
  for (let t = 0; t < count; t++) {
    const i0 = triangles[3 * t]!,
      i1 = triangles[3 * t + 1]!,
      i2 = triangles[3 * t + 2]!
    const x0 = vertices[3 * i0]!,
      y0 = vertices[3 * i0 + 1]!
    const x1 = vertices[3 * i1]!,
      y1 = vertices[3 * i1 + 1]!
    const x2 = vertices[3 * i2]!,
      y2 = vertices[3 * i2 + 1]!
    const twiceSigned = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0)
    const o = 7 * t
    data[o] = Math.abs(twiceSigned) / 2
    meanArea += data[o]! / count
    if (twiceSigned === 0) continue
    data[o + 1] = (y1 - y2) / twiceSigned
    data[o + 2] = (y2 - y0) / twiceSigned
    data[o + 3] = (y0 - y1) / twiceSigned
    data[o + 4] = (x2 - x1) / twiceSigned
    data[o + 5] = (x0 - x2) / twiceSigned
    data[o + 6] = (x1 - x0) / twiceSigned
  }
  for (let t = 0; t < count; t++) {
    const o = 7 * t
    // a sliver carries no stiffness worth its rounding error
    if (data[o]! <= EPSILON * meanArea) data.fill(0, o, o + 7)
    for (let k = 0; k < 3; k++) vertexAreas[triangles[3 * t + k]!]! += data[o]! / 3
  }
  return { triangles: triangles as Uint32Array, data, vertexAreas }
}

/** Surface area (m²) of the height field u (#V, m). */
export function heightFieldArea(plan: Readonly<PlanElements>, u: Readonly<Float64Array>): number {
  const { triangles, data } = plan
  let area = 0
  for (let t = 0, o = 0; o < data.length; t += 3, o += 7) {
    const u0 = u[triangles[t]!]!,
      u1 = u[triangles[t + 1]!]!,
      u2 = u[triangles[t + 2]!]!
    const gx = u0 * data[o + 1]! + u1 * data[o + 2]! + u2 * data[o + 3]!
    const gy = u0 * data[o + 4]! + u1 * data[o + 5]! + u2 * data[o + 6]!
    area += data[o]! * Math.sqrt(1 + gx * gx + gy * gy)
  }
  return area
}

/**
 * out = ∂Area/∂u (#V, m) for every vertex, fixed ones included. linearised: the gradient of the
 * Dirichlet energy ½∑A_T|∇u_T|² instead (the small-slope limit, Laplace's equation).
 */
export function heightFieldAreaGradient(
  out: Float64Array,
  plan: Readonly<PlanElements>,
  u: Readonly<Float64Array>,
  linearised = false,
): Float64Array {
  const { triangles, data } = plan
  out.fill(0)
  for (let t = 0, o = 0; o < data.length; t += 3, o += 7) {
    const i0 = triangles[t]!,
      i1 = triangles[t + 1]!,
      i2 = triangles[t + 2]!
    const u0 = u[i0]!,
      u1 = u[i1]!,
      u2 = u[i2]!
    const gx = u0 * data[o + 1]! + u1 * data[o + 2]! + u2 * data[o + 3]!
    const gy = u0 * data[o + 4]! + u1 * data[o + 5]! + u2 * data[o + 6]!
    const s = linearised ? data[o]! : data[o]! / Math.sqrt(1 + gx * gx + gy * gy)
    out[i0]! += s * (gx * data[o + 1]! + gy * data[o + 4]!)
    out[i1]! += s * (gx * data[o + 2]! + gy * data[o + 5]!)
    out[i2]! += s * (gx * data[o + 3]! + gy * data[o + 6]!)
  }
  return out
}

/**
 * Writes the Hessian of the area on the free heights into pattern.matrix.values.
 * linearised: the slope-zero Hessian, i.e. the cotan stiffness of Laplace's equation (one Newton
 * step with it from any start gives the small-slope solution).
 */
export function assembleAreaHessian(
  pattern: TrianglePattern,
  plan: Readonly<PlanElements>,
  u: Readonly<Float64Array>,
  linearised = false,
): void {
  const { triangles, data } = plan
  const values = pattern.matrix.values
  const slots = pattern.triangleSlots
  values.fill(0)
  for (let t = 0, o = 0; o < data.length; t += 3, o += 7) {
    let m00 = 1,
      m01 = 0,
      m11 = 1
    if (!linearised) {
      const u0 = u[triangles[t]!]!,
        u1 = u[triangles[t + 1]!]!,
        u2 = u[triangles[t + 2]!]!
      const gx = u0 * data[o + 1]! + u1 * data[o + 2]! + u2 * data[o + 3]!
      const gy = u0 * data[o + 4]! + u1 * data[o + 5]! + u2 * data[o + 6]!
      const w2 = 1 + gx * gx + gy * gy
      const w = Math.sqrt(w2)
      const w3 = w2 * w
      m00 = 1 / w - (gx * gx) / w3
      m01 = -(gx * gy) / w3
      m11 = 1 / w - (gy * gy) / w3
    }
    const area = data[o]!
    const base = 3 * t // t steps by 3, slots by 9 per triangle
    for (let a = 0; a < 3; a++) {
      const ax = data[o + 1 + a]!,
        ay = data[o + 4 + a]!
      const max = m00 * ax + m01 * ay
      const may = m01 * ax + m11 * ay
      for (let b = 0; b < 3; b++) {
        const slot = slots[base + 3 * a + b]!
        if (slot >= 0) values[slot]! += area * (max * data[o + 1 + b]! + may * data[o + 4 + b]!)
      }
    }
  }
}

/**
 * out = H(u)·delta over all vertices (#V, m): the area Hessian at u applied to a full vector, used
 * to carry a change of the frame heights into the interior (the linearised response).
 */
export function areaHessianProduct(
  out: Float64Array,
  plan: Readonly<PlanElements>,
  u: Readonly<Float64Array>,
  delta: Readonly<Float64Array>,
): Float64Array {
  const { triangles, data } = plan
  out.fill(0)
  for (let t = 0, o = 0; o < data.length; t += 3, o += 7) {
    const i0 = triangles[t]!,
      i1 = triangles[t + 1]!,
      i2 = triangles[t + 2]!
    const d0 = delta[i0]!,
      d1 = delta[i1]!,
      d2 = delta[i2]!
    if (d0 === 0 && d1 === 0 && d2 === 0) continue
    const u0 = u[i0]!,
      u1 = u[i1]!,
      u2 = u[i2]!
    const gx = u0 * data[o + 1]! + u1 * data[o + 2]! + u2 * data[o + 3]!
    const gy = u0 * data[o + 4]! + u1 * data[o + 5]! + u2 * data[o + 6]!
    const w2 = 1 + gx * gx + gy * gy
    const w = Math.sqrt(w2)
    const w3 = w2 * w
    const dx = d0 * data[o + 1]! + d1 * data[o + 2]! + d2 * data[o + 3]!
    const dy = d0 * data[o + 4]! + d1 * data[o + 5]! + d2 * data[o + 6]!
    // M·∇δ with M = I/w − g gᵀ/w³, times the plan area
    const gd = (gx * dx + gy * dy) / w3
    const mx = data[o]! * (dx / w - gx * gd)
    const my = data[o]! * (dy / w - gy * gd)
    out[i0]! += mx * data[o + 1]! + my * data[o + 4]!
    out[i1]! += mx * data[o + 2]! + my * data[o + 5]!
    out[i2]! += mx * data[o + 3]! + my * data[o + 6]!
  }
  return out
}
