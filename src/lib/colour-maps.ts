/**
 * Colour maps for the surface: by height, by slope, and by flat / ponding risk. The ramps are our
 * own, built from the app palette (slate-teal, sand, clay). Stops are sRGB hex; vertex colours are
 * written in linear RGB because three.js treats vertex colours as linear working-space values.
 */
import { faceCross } from '../../shared/mesh/quantities'

export type ColourMode = 'height' | 'slope' | 'flat'

export interface Stop {
  /** Position along the ramp, 0..1. */
  at: number
  hex: string
}

/** Low (deep teal, shaded) to high (pale sand, sunlit). */
export const HEIGHT_RAMP: readonly Stop[] = [
  { at: 0, hex: '#24484d' },
  { at: 0.35, hex: '#4f8a86' },
  { at: 0.7, hex: '#d8bf94' },
  { at: 1, hex: '#f6ecd6' },
]

/** Flat (clay, water stays) through sand to steep (deep teal, sheds water fast). */
export const SLOPE_RAMP: readonly Stop[] = [
  { at: 0, hex: '#b4553d' },
  { at: 0.25, hex: '#d8bf94' },
  { at: 0.6, hex: '#6f9a86' },
  { at: 1, hex: '#24484d' },
]

/** Slopes at or above this (degrees) take the steep end of the slope ramp. */
export const SLOPE_SPAN = 60

/**
 * Slope classes of the prestress-state shape, flattest first. None is labelled safe: the shape
 * under prestress alone says nothing about drainage once wind, snow or water load the membrane.
 */
export const FLAT_CLASSES = [
  { key: 'flat', label: 'flat (prestress state): ponding and flutter risk', hex: '#b4553d' },
  { key: 'marginal', label: 'shallow (prestress state): check drainage', hex: '#d8bf94' },
  { key: 'sloped', label: 'sloped (prestress state): drainage under load still to be checked', hex: '#4f7a52' },
] as const

/** sRGB hex ('#rrggbb') to sRGB components 0..1. */
export function hexToRgb(hex: string): [number, number, number] {
  const v = Number.parseInt(hex.slice(1), 16)
  return [((v >> 16) & 255) / 255, ((v >> 8) & 255) / 255, (v & 255) / 255]
}

/** sRGB component to linear (IEC 61966-2-1 transfer function). */
export function srgbToLinear(c: number): number {
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4
}

/** sRGB colour at t (clamped to 0..1) along a ramp, interpolated in sRGB like a CSS gradient. */
export function rampColour(stops: readonly Stop[], t: number): [number, number, number] {
  const u = Number.isFinite(t) ? Math.min(1, Math.max(0, t)) : 0
  for (let i = 1; i < stops.length; i++) {
    const a = stops[i - 1]!
    const b = stops[i]!
    if (u <= b.at) {
      const f = b.at > a.at ? (u - a.at) / (b.at - a.at) : 0
      const ca = hexToRgb(a.hex)
      const cb = hexToRgb(b.hex)
      return [ca[0] + f * (cb[0] - ca[0]), ca[1] + f * (cb[1] - ca[1]), ca[2] + f * (cb[2] - ca[2])]
    }
  }
  return hexToRgb(stops[stops.length - 1]!.hex)
}

/** A CSS linear-gradient of a ramp, for the legend. */
export function rampCss(stops: readonly Stop[], direction = 'to right'): string {
  return `linear-gradient(${direction}, ${stops.map((s) => `${s.hex} ${Math.round(s.at * 100)}%`).join(', ')})`
}

/**
 * Slope of the surface at each vertex, degrees from horizontal, from the area-weighted average of
 * the normals of the faces around it (face cross products, each turned to point up first: meshers
 * differ in orientation). vertices: #V×3 (m); triangles: #T×3 indices; out: #V (degrees), written
 * and returned. Isolated vertices get 0.
 */
export function vertexSlopes<T extends Float32Array | Float64Array>(
  out: T,
  vertices: ArrayLike<number>,
  triangles: ArrayLike<number>,
): T {
  const n = new Float64Array(3 * out.length)
  const cross = new Float64Array(3)
  for (let t = 0; 3 * t + 2 < triangles.length; t++) {
    faceCross(vertices, triangles, t, cross, 0)
    const up = cross[2]! < 0 ? -1 : 1
    for (let k = 0; k < 3; k++) {
      const v = 3 * triangles[3 * t + k]!
      for (let d = 0; d < 3; d++) n[v + d]! += up * cross[d]!
    }
  }
  for (let v = 0; v < out.length; v++) {
    const nx = n[3 * v]!,
      ny = n[3 * v + 1]!,
      nz = n[3 * v + 2]!
    out[v] = nx === 0 && ny === 0 && nz === 0 ? 0 : (Math.atan2(Math.hypot(nx, ny), nz) * 180) / Math.PI
  }
  return out
}

/** Value range shown by the legend: metres for height, degrees for slope and flat risk. */
export interface ColourRange {
  min: number
  max: number
}

/**
 * Writes linear RGB vertex colours (#V×3) for a colour mode and returns the range mapped.
 * flatThreshold (degrees): faces flatter than it count as flat; twice it counts as shallow.
 */
export function surfaceColours(
  out: Float32Array,
  vertices: Readonly<Float32Array>,
  triangles: Readonly<Uint32Array>,
  mode: ColourMode,
  flatThreshold: number,
): ColourRange {
  const count = Math.floor(vertices.length / 3)
  const values = new Float32Array(count)
  if (mode === 'height') for (let v = 0; v < count; v++) values[v] = vertices[3 * v + 2]!
  else vertexSlopes(values, vertices, triangles)
  let min = Infinity
  let max = -Infinity
  for (const v of values) {
    if (v < min) min = v
    if (v > max) max = v
  }
  if (count === 0) min = max = 0
  const flatRgb = FLAT_CLASSES.map((c) => hexToRgb(c.hex))
  for (let v = 0; v < count; v++) {
    const value = values[v]!
    let rgb: [number, number, number]
    if (mode === 'flat') rgb = flatRgb[value < flatThreshold ? 0 : value < 2 * flatThreshold ? 1 : 2]!
    else if (mode === 'slope') rgb = rampColour(SLOPE_RAMP, value / SLOPE_SPAN)
    else rgb = rampColour(HEIGHT_RAMP, max > min ? (value - min) / (max - min) : 0.5)
    out[3 * v] = srgbToLinear(rgb[0])
    out[3 * v + 1] = srgbToLinear(rgb[1])
    out[3 * v + 2] = srgbToLinear(rgb[2])
  }
  return mode === 'slope' ? { min: 0, max: SLOPE_SPAN } : { min, max }
}
