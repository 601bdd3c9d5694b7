/**
 * A small picture of a settled surface for the rooms list: the plan view, coloured by height
 * (teal low → sand high, the workbench's ramp) and shaded by the slope of each triangle so the
 * anticlastic shape reads at a glance. Rasterised here, encoded as PNG (png.ts): a few kB per room.
 */
import { encodePng } from './png.js'

/** Picture size in pixels. */
export const THUMB_WIDTH = 120
export const THUMB_HEIGHT = 90
const MARGIN = 6
const LOW = [0x24, 0x48, 0x4d] as const
const HIGH = [0xe3, 0xcf, 0xa8] as const
const PAPER = [0xf7, 0xf4, 0xee] as const

/**
 * vertices: #V×3 (Float32Array or Float64Array, metres); triangles: #T×3 vertex indices.
 * Returns a PNG; the plan is scaled to fit with its aspect ratio kept.
 */
export function surfaceThumbnail(vertices: ArrayLike<number>, triangles: ArrayLike<number>): Buffer {
  const n = Math.floor(vertices.length / 3)
  let [minX, minY, minZ, maxX, maxY, maxZ] = [Infinity, Infinity, Infinity, -Infinity, -Infinity, -Infinity]
  for (let i = 0; i < n; i++) {
    const x = vertices[3 * i]!,
      y = vertices[3 * i + 1]!,
      z = vertices[3 * i + 2]!
    minX = Math.min(minX, x)
    maxX = Math.max(maxX, x)
    minY = Math.min(minY, y)
    maxY = Math.max(maxY, y)
    minZ = Math.min(minZ, z)
    maxZ = Math.max(maxZ, z)
  }
  const rgb = new Uint8Array(THUMB_WIDTH * THUMB_HEIGHT * 3)
  for (let p = 0; p < THUMB_WIDTH * THUMB_HEIGHT; p++) rgb.set(PAPER, 3 * p)
  const depth = new Float32Array(THUMB_WIDTH * THUMB_HEIGHT).fill(-Infinity)
  if (n === 0 || !Number.isFinite(minX)) return encodePng(THUMB_WIDTH, THUMB_HEIGHT, rgb)

  const scale = Math.min(
    (THUMB_WIDTH - 2 * MARGIN) / Math.max(maxX - minX, 1e-9),
    (THUMB_HEIGHT - 2 * MARGIN) / Math.max(maxY - minY, 1e-9),
  )
  const ox = (THUMB_WIDTH - scale * (maxX - minX)) / 2
  const oy = (THUMB_HEIGHT - scale * (maxY - minY)) / 2
  // Plan x to the right, plan y up (image rows grow downwards).
  const px = (i: number) => ox + scale * (vertices[3 * i]! - minX)
  const py = (i: number) => THUMB_HEIGHT - oy - scale * (vertices[3 * i + 1]! - minY)
  const zSpan = Math.max(maxZ - minZ, 1e-9)

  for (let t = 0; t + 2 < triangles.length; t += 3) {
    const a = triangles[t]!,
      b = triangles[t + 1]!,
      c = triangles[t + 2]!
    if (a >= n || b >= n || c >= n) continue
    const shade = lambert(vertices, a, b, c)
    const [ax, ay, bx, by, cx, cy] = [px(a), py(a), px(b), py(b), px(c), py(c)]
    const area = (bx - ax) * (cy - ay) - (cx - ax) * (by - ay)
    if (Math.abs(area) < 1e-12) continue
    const x0 = Math.max(0, Math.floor(Math.min(ax, bx, cx))),
      x1 = Math.min(THUMB_WIDTH - 1, Math.ceil(Math.max(ax, bx, cx)))
    const y0 = Math.max(0, Math.floor(Math.min(ay, by, cy))),
      y1 = Math.min(THUMB_HEIGHT - 1, Math.ceil(Math.max(ay, by, cy)))
    for (let y = y0; y <= y1; y++) {
      for (let x = x0; x <= x1; x++) {
        // Barycentric weights of the pixel centre; a pixel belongs to every triangle that covers it.
        const sx = x + 0.5,
          sy = y + 0.5
        const w1 = ((bx - sx) * (cy - sy) - (cx - sx) * (by - sy)) / area
        const w2 = ((cx - sx) * (ay - sy) - (ax - sx) * (cy - sy)) / area
        const w3 = 1 - w1 - w2
        if (w1 < -1e-6 || w2 < -1e-6 || w3 < -1e-6) continue
        const z = w1 * vertices[3 * a + 2]! + w2 * vertices[3 * b + 2]! + w3 * vertices[3 * c + 2]!
        const p = y * THUMB_WIDTH + x
        if (z <= depth[p]!) continue // seen from above: the highest layer wins
        depth[p] = z
        const s = (z - minZ) / zSpan
        for (let k = 0; k < 3; k++) rgb[3 * p + k] = Math.round((LOW[k]! + s * (HIGH[k]! - LOW[k]!)) * shade)
      }
    }
  }
  return encodePng(THUMB_WIDTH, THUMB_HEIGHT, rgb)
}

/** Brightness 0.72…1 of a triangle lit from the upper left (steeper faces away from it are darker). */
function lambert(v: ArrayLike<number>, a: number, b: number, c: number): number {
  const ux = v[3 * b]! - v[3 * a]!,
    uy = v[3 * b + 1]! - v[3 * a + 1]!,
    uz = v[3 * b + 2]! - v[3 * a + 2]!
  const wx = v[3 * c]! - v[3 * a]!,
    wy = v[3 * c + 1]! - v[3 * a + 1]!,
    wz = v[3 * c + 2]! - v[3 * a + 2]!
  let nx = uy * wz - uz * wy,
    ny = uz * wx - ux * wz,
    nz = ux * wy - uy * wx
  if (nz < 0) [nx, ny, nz] = [-nx, -ny, -nz]
  const len = Math.hypot(nx, ny, nz) || 1
  const light = (-0.45 * nx + 0.45 * ny + 0.77 * nz) / len
  return 0.72 + 0.28 * Math.max(0, Math.min(1, light))
}
