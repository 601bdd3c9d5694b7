/**
 * Drawing the report's views as SVG: a plan transform (north up) and an orthographic three-quarter
 * projection. SVG instead of a WebGL canvas because vectors print sharp and never come out blank.
 * Units: metres in, SVG user units (px at 96 dpi) out; SVG's y axis points down.
 */
import { faceCross } from '../../../shared/mesh/quantities'

/** Maps plan metres to SVG units inside a box of given width, keeping the aspect ratio. */
export interface PlanTransform {
  width: number
  height: number
  /** SVG units per metre. */
  scale: number
  x: (x: number) => number
  y: (y: number) => number
}

/** Plan extent of #V×3 vertices fitted into `width` (height follows, at most `maxHeight`), with `pad` around. */
export function planTransform(
  vertices: ArrayLike<number>,
  width: number,
  maxHeight: number,
  pad: number,
): PlanTransform {
  let x0 = Infinity,
    y0 = Infinity,
    x1 = -Infinity,
    y1 = -Infinity
  for (let i = 0; i + 2 < vertices.length; i += 3) {
    x0 = Math.min(x0, vertices[i]!)
    x1 = Math.max(x1, vertices[i]!)
    y0 = Math.min(y0, vertices[i + 1]!)
    y1 = Math.max(y1, vertices[i + 1]!)
  }
  if (!(x1 >= x0)) x0 = y0 = x1 = y1 = 0
  const spanX = Math.max(x1 - x0, 1e-9),
    spanY = Math.max(y1 - y0, 1e-9)
  const scale = Math.min((width - 2 * pad) / spanX, (maxHeight - 2 * pad) / spanY)
  const height = spanY * scale + 2 * pad
  const offX = (width - spanX * scale) / 2
  return { width, height, scale, x: (x) => offX + (x - x0) * scale, y: (y) => height - pad - (y - y0) * scale }
}

/** An orthographic view: screen right, screen up and towards-the-viewer unit vectors. */
export interface ViewAxes {
  right: [number, number, number]
  up: [number, number, number]
  towards: [number, number, number]
}

/**
 * Axes of a view from azimuth `azimuth` (degrees counter-clockwise from +x: where the viewer stands
 * in plan) and `elevation` (degrees above horizontal). 225°, 30° looks from the south-west, down.
 */
export function viewAxes(azimuth: number, elevation: number): ViewAxes {
  const a = (azimuth * Math.PI) / 180,
    e = (elevation * Math.PI) / 180
  const towards: [number, number, number] = [Math.cos(e) * Math.cos(a), Math.cos(e) * Math.sin(a), Math.sin(e)]
  const right: [number, number, number] = [-Math.sin(a), Math.cos(a), 0]
  // up = towards × right
  const up: [number, number, number] = [
    towards[1] * right[2] - towards[2] * right[1],
    towards[2] * right[0] - towards[0] * right[2],
    towards[0] * right[1] - towards[1] * right[0],
  ]
  return { right, up, towards }
}

const dot = (v: readonly number[], x: number, y: number, z: number): number => v[0]! * x + v[1]! * y + v[2]! * z

/**
 * Projects #V×3 vertices: out is #V×3 with screen right, screen up and depth (larger = nearer the
 * viewer), in metres.
 */
export function projectVertices(vertices: ArrayLike<number>, axes: Readonly<ViewAxes>): Float64Array {
  const out = new Float64Array(vertices.length)
  for (let i = 0; i + 2 < vertices.length; i += 3) {
    const x = vertices[i]!,
      y = vertices[i + 1]!,
      z = vertices[i + 2]!
    out[i] = dot(axes.right, x, y, z)
    out[i + 1] = dot(axes.up, x, y, z)
    out[i + 2] = dot(axes.towards, x, y, z)
  }
  return out
}

/**
 * Face order for the painter's algorithm: far faces first (by mean depth of their corners).
 * Exact for a height field seen from above; folds seen edge-on may overlap slightly.
 */
export function backToFront(projected: Readonly<Float64Array>, triangles: ArrayLike<number>): Uint32Array {
  const n = Math.floor(triangles.length / 3)
  const depth = new Float64Array(n)
  for (let t = 0; t < n; t++) {
    depth[t] =
      projected[3 * triangles[3 * t]! + 2]! +
      projected[3 * triangles[3 * t + 1]! + 2]! +
      projected[3 * triangles[3 * t + 2]! + 2]!
  }
  return Uint32Array.from({ length: n }, (_, i) => i).sort((a, b) => depth[a]! - depth[b]!)
}

/**
 * Lambert shading of each face, two-sided: ambient + diffuse·|n·light|, in 0..1. light: a unit
 * vector towards the light. vertices: #V×3, triangles: #T×3; returns #T values.
 */
export function faceShades(
  vertices: ArrayLike<number>,
  triangles: ArrayLike<number>,
  light: readonly number[],
  ambient = 0.35,
): Float64Array {
  const n = Math.floor(triangles.length / 3)
  const out = new Float64Array(n)
  const cross = new Float64Array(3)
  for (let t = 0; t < n; t++) {
    faceCross(vertices, triangles, t, cross, 0)
    const nx = cross[0]!,
      ny = cross[1]!,
      nz = cross[2]!
    const len = Math.hypot(nx, ny, nz)
    out[t] = len > 0 ? ambient + (1 - ambient) * Math.abs(dot(light, nx, ny, nz) / len) : ambient
  }
  return out
}

/**
 * Slope of each face in degrees from horizontal (angle of its normal from vertical).
 * vertices: #V×3, triangles: #T×3; returns #T values.
 */
export function faceSlopeAngles(vertices: ArrayLike<number>, triangles: ArrayLike<number>): Float64Array {
  const up = faceShades(vertices, triangles, [0, 0, 1], 0)
  return up.map((c) => (Math.acos(Math.min(1, c)) * 180) / Math.PI)
}

/** A round length for a scale bar about a fifth of `span` metres: 1, 2 or 5 × 10^k. */
export function scaleBarLength(span: number): number {
  const raw = Math.max(span, 1e-9) / 5
  const exp = 10 ** Math.floor(Math.log10(raw))
  return [5, 2, 1].map((f) => f * exp).find((l) => l <= raw) ?? exp
}
