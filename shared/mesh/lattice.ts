/**
 * Interior points of the plan domain on a hexagonal lattice of spacing h, kept at least `gap`
 * metres off every boundary segment.
 */
import { pointSegmentDistance } from './plan-geometry'

/**
 * Plan area per vertex of an equilateral lattice of side h, per h²: each interior vertex is shared
 * by six triangles of (√3/4)h² and each triangle has three vertices, so a vertex carries two
 * triangles: (√3/2)h² ≈ 0.866 h².
 */
export const LATTICE_AREA_PER_VERTEX = Math.sqrt(3) / 2

/** Vertex count of a lattice mesh of element size h (m) over `area` m² (boundary rows add a few). */
export const estimatedVertexCount = (area: number, h: number): number => area / (LATTICE_AREA_PER_VERTEX * h * h)

/** The element size (m) at which `area` m² meshes to about `vertices` vertices. */
export const edgeLengthFor = (area: number, vertices: number): number =>
  Math.sqrt(area / (LATTICE_AREA_PER_VERTEX * vertices))

/**
 * xyz: #B×3 boundary samples (m); segments: closed loops as index pairs into them (every loop's
 * segments, outer and holes). Returns #P×2 plan coordinates. Inside = even–odd rule over all
 * segments, so holes are excluded. Cost O(P + B) with a uniform bucket grid of cell size h.
 */
export function latticePoints(
  xyz: readonly number[],
  segments: readonly [number, number][],
  h: number,
  gap: number,
): Float64Array {
  let minX = Infinity,
    minY = Infinity,
    maxX = -Infinity,
    maxY = -Infinity
  for (let i = 0; i < xyz.length; i += 3) {
    minX = Math.min(minX, xyz[i]!)
    maxX = Math.max(maxX, xyz[i]!)
    minY = Math.min(minY, xyz[i + 1]!)
    maxY = Math.max(maxY, xyz[i + 1]!)
  }
  const dy = (h * Math.sqrt(3)) / 2
  const rows = Math.max(0, Math.floor((maxY - minY) / dy))
  // Centre the lattice rows in the box so symmetric frames get symmetric meshes.
  const y0 = minY + (maxY - minY - rows * dy) / 2
  const crossings: number[][] = Array.from({ length: rows + 1 }, () => [])
  for (const [p, q] of segments) {
    const ax = xyz[3 * p]!,
      ay = xyz[3 * p + 1]!,
      bx = xyz[3 * q]!,
      by = xyz[3 * q + 1]!
    if (ay === by) continue
    const lo = Math.min(ay, by),
      hi = Math.max(ay, by)
    const r0 = Math.max(0, Math.ceil((lo - y0) / dy))
    const r1 = Math.min(rows, Math.floor((hi - y0) / dy))
    for (let r = r0; r <= r1; r++) {
      const y = y0 + r * dy
      // Half-open rule in y so a row through a vertex counts one crossing, not two.
      if (y >= lo && y < hi) crossings[r]!.push(ax + ((y - ay) * (bx - ax)) / (by - ay))
    }
  }
  const grid = new SegmentGrid(xyz, segments, minX, minY, h, maxX, maxY)
  const out: number[] = []
  for (let r = 0; r <= rows; r++) {
    const xs = crossings[r]!.sort((a, b) => a - b)
    const y = y0 + r * dy
    const shift = r % 2 === 0 ? 0 : h / 2
    for (let k = 0; k + 1 < xs.length; k += 2) {
      const a = xs[k]!,
        b = xs[k + 1]!
      const start = Math.ceil((a - minX - shift) / h)
      for (let x = minX + shift + start * h; x < b; x += h) {
        if (!grid.near(x, y, gap)) out.push(x, y)
      }
    }
  }
  return Float64Array.from(out)
}

/** Dense bucket grid (CSR) of segments for "is any segment within d ≤ cell size?" queries. */
class SegmentGrid {
  private readonly nx: number
  private readonly ny: number
  private readonly start: Int32Array
  private readonly items: Int32Array

  constructor(
    private readonly xyz: readonly number[],
    private readonly segments: readonly [number, number][],
    private readonly x0: number,
    private readonly y0: number,
    private readonly size: number,
    maxX: number,
    maxY: number,
  ) {
    this.nx = Math.floor((maxX - x0) / size) + 3
    this.ny = Math.floor((maxY - y0) / size) + 3
    this.start = new Int32Array(this.nx * this.ny + 1)
    this.forCells((cell) => this.start[cell + 1]!++)
    for (let c = 0; c < this.nx * this.ny; c++) this.start[c + 1]! += this.start[c]!
    this.items = new Int32Array(this.start[this.nx * this.ny]!)
    const fill = this.start.slice(0, this.nx * this.ny)
    this.forCells((cell, s) => (this.items[fill[cell]!++] = s))
  }

  private forCells(visit: (cell: number, segment: number) => void): void {
    const xyz = this.xyz
    this.segments.forEach(([p, q], s) => {
      const cx0 = this.cx(Math.min(xyz[3 * p]!, xyz[3 * q]!)),
        cx1 = this.cx(Math.max(xyz[3 * p]!, xyz[3 * q]!))
      const cy0 = this.cy(Math.min(xyz[3 * p + 1]!, xyz[3 * q + 1]!)),
        cy1 = this.cy(Math.max(xyz[3 * p + 1]!, xyz[3 * q + 1]!))
      for (let i = cx0; i <= cx1; i++) for (let j = cy0; j <= cy1; j++) visit(i * this.ny + j, s)
    })
  }

  private cx(x: number): number {
    return Math.min(this.nx - 2, Math.max(1, Math.floor((x - this.x0) / this.size) + 1))
  }
  private cy(y: number): number {
    return Math.min(this.ny - 2, Math.max(1, Math.floor((y - this.y0) / this.size) + 1))
  }

  /** Is a segment within d (≤ cell size) of (x, y)? */
  near(x: number, y: number, d: number): boolean {
    const i0 = this.cx(x),
      j0 = this.cy(y)
    const xyz = this.xyz
    for (let i = i0 - 1; i <= i0 + 1; i++) {
      for (let j = j0 - 1; j <= j0 + 1; j++) {
        const c = i * this.ny + j
        for (let k = this.start[c]!; k < this.start[c + 1]!; k++) {
          const [p, q] = this.segments[this.items[k]!]!
          if (pointSegmentDistance(x, y, xyz[3 * p]!, xyz[3 * p + 1]!, xyz[3 * q]!, xyz[3 * q + 1]!) < d) return true
        }
      }
    }
    return false
  }
}
