/** The JSON form of a solved surface (PRODUCT.md "Surface result"). */
import { CAUTION } from '../protocol/caution'
import type { Figures, MembraneMesh, SolverReport, SurfaceResult } from '../types'

/** Typed-array mesh + figures + solver report → the plain SurfaceResult shape. */
export function toSurfaceResult(mesh: Readonly<MembraneMesh>, figures: Figures, solver: SolverReport): SurfaceResult {
  const V = mesh.vertices,
    T = mesh.triangles
  const vertices: [number, number, number][] = []
  for (let v = 0; v < V.length; v += 3) vertices.push([V[v]!, V[v + 1]!, V[v + 2]!])
  const triangles: [number, number, number][] = []
  for (let t = 0; t < T.length; t += 3) triangles.push([T[t]!, T[t + 1]!, T[t + 2]!])
  return { vertices, triangles, figures, solver }
}

/**
 * JSON text of a SurfaceResult with the `caution` field beside it (someone may build from the file);
 * refuses non-finite numbers (JSON would turn them into null).
 */
export function surfaceResultToJson(result: Readonly<SurfaceResult>): string {
  return JSON.stringify({ ...result, caution: CAUTION }, (key, value: unknown) => {
    if (typeof value === 'number' && !Number.isFinite(value))
      throw new Error(`surface result: ${key || 'value'} is not finite (${value})`)
    return value
  })
}
