/**
 * Cutting-pattern types (PRODUCT.md "Cuts file and pattern result"). Lengths in metres, strains as
 * fractions (0.01 = 1 %), compensation in per cent, angles in degrees.
 */

/** A vertical or tilted cutting plane; the seam is where it meets the surface. */
export interface PlaneSeam {
  kind: 'plane'
  point: [number, number, number]
  /** Need not be unit length; must not be zero. */
  normal: [number, number, number]
}

/** The shortest line on the surface between two points (each snapped to the nearest surface vertex). */
export interface GeodesicSeam {
  kind: 'geodesic'
  from: [number, number, number]
  to: [number, number, number]
}

export type Seam = PlaneSeam | GeodesicSeam

/** What to cut and how (the cuts file without its format/version header). */
export interface CutSettings {
  /** Warp direction in plan, degrees from +x, counter-clockwise. */
  warpAngle: number
  /** When given, the warp runs radially from this plan point instead (tents: strips from the mast). */
  warpCentre?: [number, number] | undefined
  /** Per cent in warp and fill: compensated size = uncompensated × (1 − c/100). */
  compensation: { warp: number; fill: number }
  /** Added along seams only, m (frame edges get none: hems and cable pockets are the fabricator's). */
  seamAllowance: number
  /** Usable fabric width, m. */
  rollWidth: number
  seams: Seam[]
}

/** A triangle mesh in flat arrays: vertices #V×3 Float64Array (m), triangles #T×3 Uint32Array. */
export interface TriangleMesh {
  vertices: Float64Array
  triangles: Uint32Array
}

export interface StripSeam {
  /** Id of the strip on the other side (its own id for a slit that ends inside the strip). */
  with: string
  /** Length of the shared seam on the surface, m. */
  length3d: number
  /** Length of this side in the compensated flat pattern, m. */
  lengthFlat: number
  /** This side's lengthFlat minus the other side's, m. */
  mismatch: number
}

/** One strip's flat pattern. u runs along the warp (the roll's length), v across it. */
export interface StripPattern {
  id: string
  /** Compensated outline (outer boundary), closed implicitly, counter-clockwise, m. */
  outline: [number, number][]
  /** The outline offset by the seam allowance along seams, m. */
  cutLine: [number, number][]
  area3d: number
  /** Area of the compensated flat pattern (without allowance), m². */
  areaFlat: number
  /** Extent of the cut line along the warp, m. */
  length: number
  /** Extent of the cut line across the warp (to compare with the roll width), m. */
  width: number
  overWidth: boolean
  /** Greatest |strain| along warp and fill, and the area-weighted RMS of the principal strains. */
  strain: { maxWarp: number; maxFill: number; rms: number }
  seams: StripSeam[]
}

export interface PatternResult {
  strips: StripPattern[]
  caution: string
}

export const PATTERN_CAUTION =
  'Caution: cutting patterns are preliminary. The fabricator checks every pattern against the biaxial test of the actual fabric batch, and the engineer of record approves it, before anything is cut.'
