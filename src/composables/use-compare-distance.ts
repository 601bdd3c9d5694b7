/**
 * Distance from each vertex of one surface to the nearest vertex of another, for colouring the
 * second surface of a comparison. Nearest-vertex (not nearest-point-on-triangle) distance
 * overestimates the true gap by at most about half an element edge, which is fine for a map whose
 * purpose is "where did the shape move"; the legend says so.
 */

/**
 * For each vertex of `to` (#M×3, m), the Euclidean distance to the nearest vertex of `from`
 * (#N×3, m). Uses a uniform grid over `from` sized so each cell holds about two vertices, and
 * searches rings of cells outward until no closer vertex can exist. Returns Float64Array(#M), m.
 * An empty `from` gives Infinity everywhere.
 */
export function nearestVertexDistances(from: ArrayLike<number>, to: ArrayLike<number>): Float64Array {
  const n = Math.floor(from.length / 3)
  const m = Math.floor(to.length / 3)
  const out = new Float64Array(m).fill(Number.POSITIVE_INFINITY)
  if (n === 0) return out
  const min = [Infinity, Infinity, Infinity]
  const max = [-Infinity, -Infinity, -Infinity]
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < 3; k++) {
      const v = from[3 * i + k]!
      if (v < min[k]!) min[k] = v
      if (v > max[k]!) max[k] = v
    }
  }
  // Membranes are sheets: size cells from the two largest extents so a flat surface still gets ~2 per cell.
  const ext = [max[0]! - min[0]!, max[1]! - min[1]!, max[2]! - min[2]!].sort((a, b) => b - a)
  const cell = Math.max(Math.sqrt(((ext[0]! || 1) * (ext[1]! || ext[0]! || 1) * 2) / n), 1e-9)
  const dims = [0, 1, 2].map((k) => Math.max(1, Math.ceil((max[k]! - min[k]!) / cell) + 1))
  const [nx, ny, nz] = dims as [number, number, number]
  const key = (ix: number, iy: number, iz: number): number => (iz * ny + iy) * nx + ix
  const buckets = new Map<number, number[]>()
  const cellOf = (v: number, k: number, dim: number): number =>
    Math.min(dim - 1, Math.max(0, Math.floor((v - min[k]!) / cell)))
  for (let i = 0; i < n; i++) {
    const c = key(cellOf(from[3 * i]!, 0, nx), cellOf(from[3 * i + 1]!, 1, ny), cellOf(from[3 * i + 2]!, 2, nz))
    const list = buckets.get(c)
    if (list) list.push(i)
    else buckets.set(c, [i])
  }
  const maxRing = Math.max(nx, ny, nz)
  for (let j = 0; j < m; j++) {
    const px = to[3 * j]!
    const py = to[3 * j + 1]!
    const pz = to[3 * j + 2]!
    const cx = cellOf(px, 0, nx)
    const cy = cellOf(py, 1, ny)
    const cz = cellOf(pz, 2, nz)
    let best = Number.POSITIVE_INFINITY
    for (let r = 0; r <= maxRing; r++) {
      // Every vertex in ring r is at least (r - 1) cells away from p, which may lie anywhere in its cell
      // (or outside the grid, clamped to the border cell, which only makes the true gap larger).
      if (r > 0 && (r - 1) * cell >= Math.sqrt(best)) break
      for (let iz = cz - r; iz <= cz + r; iz++) {
        if (iz < 0 || iz >= nz) continue
        for (let iy = cy - r; iy <= cy + r; iy++) {
          if (iy < 0 || iy >= ny) continue
          for (let ix = cx - r; ix <= cx + r; ix++) {
            if (ix < 0 || ix >= nx) continue
            if (Math.max(Math.abs(ix - cx), Math.abs(iy - cy), Math.abs(iz - cz)) !== r) continue
            const list = buckets.get(key(ix, iy, iz))
            if (!list) continue
            for (const i of list) {
              const dx = from[3 * i]! - px
              const dy = from[3 * i + 1]! - py
              const dz = from[3 * i + 2]! - pz
              const d2 = dx * dx + dy * dy + dz * dz
              if (d2 < best) best = d2
            }
          }
        }
      }
    }
    out[j] = Math.sqrt(best)
  }
  return out
}
