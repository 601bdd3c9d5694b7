/**
 * From a settled surface and cut settings to flat patterns: cut, flatten each strip, turn the warp
 * onto +u, compensate, offset the cut line, measure. Pure and synchronous: the solve worker, the
 * CLI and the tests call it alike.
 */
import { cutSurface } from './cut-surface'
import { flattenStrip, type FlattenOptions } from './flatten-strip'
import { boundaryLoops, offsetPolygon, polygonArea } from './outline'
import { cutStrips, type StripMesh } from './strips'
import { PATTERN_CAUTION, type CutSettings, type PatternResult, type StripPattern, type TriangleMesh } from './types'
import { strainSummary } from './warp-strain'

export interface PatternOptions {
  signal?: { readonly aborted: boolean } | undefined
  stiffness?: FlattenOptions['stiffness']
  arapIterations?: number
  strainIterations?: number
}

/** What the room draws besides the table: each strip's flat mesh and the strip of each surface triangle. */
export interface PatternDetail {
  /** #T' Int32Array over the cut surface's triangles: index into strips. */
  triangleStrip: Int32Array
  cutSurface: TriangleMesh
  /** Per strip: flat uv (#n×2, compensated, m), its 3D positions (#n×3), triangles, warp and fill strain per triangle (#t×2). */
  flat: { uv: Float64Array; positions: Float64Array; triangles: Uint32Array; strain: Float64Array }[]
}

function centroid(strip: Readonly<StripMesh>): [number, number] {
  let x = 0,
    y = 0
  const n = strip.vertices.length / 3
  for (let v = 0; v < n; v++) {
    x += strip.vertices[3 * v]!
    y += strip.vertices[3 * v + 1]!
  }
  return [x / n, y / n]
}

/**
 * surface: vertices #V×3 (m), triangles #T×3. Strips are numbered S1, S2, … across the warp in
 * plan (from the right-hand side of the warp direction to its left), or counter-clockwise round a
 * radial warp's centre. Throws PatternError.
 */
export function computePattern(
  surface: Readonly<TriangleMesh>,
  settings: Readonly<CutSettings>,
  options: PatternOptions = {},
): { result: PatternResult; detail: PatternDetail } {
  const { mesh, seamEdges } = cutSurface(surface, settings.seams)
  const { strips, triangleStrip } = cutStrips(mesh, seamEdges)
  const a = (settings.warpAngle * Math.PI) / 180
  const centre = settings.warpCentre
  // radial warp: strips counted counter-clockwise round the centre from +x; else across the warp
  const across = (s: StripMesh) => {
    const [x, y] = centroid(s)
    if (centre) return (Math.atan2(y - centre[1], x - centre[0]) + 2 * Math.PI) % (2 * Math.PI)
    return -Math.sin(a) * x + Math.cos(a) * y
  }
  const order = strips
    .map((s, i) => ({ i, key: across(s) }))
    .sort((p, q) => p.key - q.key)
    .map((p) => p.i)
  const rank = new Int32Array(strips.length)
  order.forEach((i, r) => (rank[i] = r))
  const id = (i: number) => `S${rank[i]! + 1}`
  const cw = 1 - settings.compensation.warp / 100,
    cf = 1 - settings.compensation.fill / 100
  const patterns: StripPattern[] = []
  const flat: PatternDetail['flat'] = []
  for (const i of order) {
    const strip = strips[i]!
    const { uv, frames } = flattenStrip(strip, { ...options, warpAngle: settings.warpAngle, warpCentre: centre }, id(i))
    const strain = strainSummary(uv, strip.triangles, frames)
    for (let v = 0; v < uv.length; v += 2) {
      uv[v]! *= cw
      uv[v + 1]! *= cf
    }
    patterns.push(measureStrip(strip, uv, frames.areas, settings, id, i, strain))
    flat.push({ uv, positions: strip.vertices, triangles: strip.triangles, strain: strain.perTriangle })
  }
  fillMismatch(patterns)
  const remapped = new Int32Array(triangleStrip.length)
  for (let t = 0; t < remapped.length; t++) remapped[t] = rank[triangleStrip[t]!]!
  return {
    result: { strips: patterns, caution: PATTERN_CAUTION },
    detail: { triangleStrip: remapped, cutSurface: mesh, flat },
  }
}

function measureStrip(
  strip: Readonly<StripMesh>,
  uv: Readonly<Float64Array>,
  areas: Readonly<Float64Array>,
  settings: Readonly<CutSettings>,
  id: (i: number) => string,
  i: number,
  strain: { maxWarp: number; maxFill: number; rms: number },
): StripPattern {
  const { loops, edges } = boundaryLoops(strip.boundaryEdges)
  const polygons = loops.map((loop) => loop.map((v): [number, number] => [uv[2 * v]!, uv[2 * v + 1]!]))
  let outer = 0
  polygons.forEach((p, k) => {
    if (Math.abs(polygonArea(p)) > Math.abs(polygonArea(polygons[outer]!))) outer = k
  })
  const outline = polygons[outer]!
  const allowance = edges[outer]!.map((e) => (strip.boundaryNeighbour[e]! >= 0 ? settings.seamAllowance : 0))
  const cutLine = offsetPolygon(outline, allowance)
  const us = cutLine.map((p) => p[0]),
    vs = cutLine.map((p) => p[1])
  const width = Math.max(...vs) - Math.min(...vs)
  let areaFlat = 0
  let area3d = 0
  for (let t = 0; t < areas.length; t++) {
    area3d += areas[t]!
    const p = 2 * strip.triangles[3 * t]!,
      q = 2 * strip.triangles[3 * t + 1]!,
      r = 2 * strip.triangles[3 * t + 2]!
    areaFlat += 0.5 * ((uv[q]! - uv[p]!) * (uv[r + 1]! - uv[p + 1]!) - (uv[r]! - uv[p]!) * (uv[q + 1]! - uv[p + 1]!))
  }
  return {
    id: id(i),
    outline,
    cutLine,
    area3d,
    areaFlat,
    length: Math.max(...us) - Math.min(...us),
    width,
    overWidth: width > settings.rollWidth,
    strain: { maxWarp: strain.maxWarp, maxFill: strain.maxFill, rms: strain.rms },
    seams: seamSides(strip, uv, id),
  }
}

/** Per neighbouring strip: the shared boundary's 3D length and this side's compensated flat length. */
function seamSides(
  strip: Readonly<StripMesh>,
  uv: Readonly<Float64Array>,
  id: (i: number) => string,
): StripPattern['seams'] {
  const sides = new Map<number, { length3d: number; lengthFlat: number }>()
  const p = strip.vertices
  for (let e = 0; e < strip.boundaryNeighbour.length; e++) {
    const other = strip.boundaryNeighbour[e]!
    if (other < 0) continue
    const a = strip.boundaryEdges[2 * e]!,
      b = strip.boundaryEdges[2 * e + 1]!
    const side = sides.get(other) ?? { length3d: 0, lengthFlat: 0 }
    side.length3d += Math.hypot(p[3 * b]! - p[3 * a]!, p[3 * b + 1]! - p[3 * a + 1]!, p[3 * b + 2]! - p[3 * a + 2]!)
    side.lengthFlat += Math.hypot(uv[2 * b]! - uv[2 * a]!, uv[2 * b + 1]! - uv[2 * a + 1]!)
    sides.set(other, side)
  }
  return [...sides]
    .map(([other, s]) => ({ with: id(other), ...s, mismatch: 0 }))
    .sort((x, y) => x.with.localeCompare(y.with, 'en', { numeric: true }))
}

/** mismatch = this side's flat length − the other side's. */
function fillMismatch(patterns: StripPattern[]): void {
  const byId = new Map(patterns.map((p) => [p.id, p]))
  for (const p of patterns) {
    for (const side of p.seams) {
      const other = byId.get(side.with)?.seams.find((s) => s.with === p.id)
      side.mismatch = other ? side.lengthFlat - other.lengthFlat : 0
    }
  }
}
