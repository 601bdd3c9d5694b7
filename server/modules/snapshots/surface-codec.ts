import type { SolverReport } from '../../../shared/types.js'

// Binary layout of snapshots.surface (little-endian): "VRS1", vertex count, triangle count, solver
// JSON byte length (uint32 each); then vertices (#V×3 float32, metres), triangles (#T×3 uint32),
// then the solver report as UTF-8 JSON. Float32 is what the live stream sends, so a snapshot holds
// exactly what the team saw.
const MAGIC = 'VRS1'
const HEADER = 16

export interface StoredSurface {
  vertices: Float32Array
  triangles: Uint32Array
  solver: SolverReport
}

export function encodeSurface(s: Readonly<StoredSurface>): Buffer {
  const solver = Buffer.from(JSON.stringify(s.solver), 'utf8')
  const out = Buffer.alloc(HEADER + s.vertices.byteLength + s.triangles.byteLength + solver.length)
  out.write(MAGIC, 0, 'latin1')
  out.writeUInt32LE(s.vertices.length / 3, 4)
  out.writeUInt32LE(s.triangles.length / 3, 8)
  out.writeUInt32LE(solver.length, 12)
  Buffer.from(s.vertices.buffer, s.vertices.byteOffset, s.vertices.byteLength).copy(out, HEADER)
  Buffer.from(s.triangles.buffer, s.triangles.byteOffset, s.triangles.byteLength).copy(
    out,
    HEADER + s.vertices.byteLength,
  )
  solver.copy(out, HEADER + s.vertices.byteLength + s.triangles.byteLength)
  return out
}

/** Reads a stored surface back; throws when the bytes are not in the layout above. */
export function decodeSurface(bytes: Buffer): StoredSurface {
  if (bytes.length < HEADER || bytes.toString('latin1', 0, 4) !== MAGIC)
    throw new Error('stored surface: unknown format')
  const nV = bytes.readUInt32LE(4)
  const nT = bytes.readUInt32LE(8)
  const nS = bytes.readUInt32LE(12)
  const vBytes = nV * 12
  const tBytes = nT * 12
  if (bytes.length !== HEADER + vBytes + tBytes + nS)
    throw new Error('stored surface: length does not match its header')
  // Copy into fresh, aligned buffers: a Buffer from the driver may start at any byte offset.
  const vertices = new Float32Array(nV * 3)
  const triangles = new Uint32Array(nT * 3)
  bytes.copy(Buffer.from(vertices.buffer), 0, HEADER, HEADER + vBytes)
  bytes.copy(Buffer.from(triangles.buffer), 0, HEADER + vBytes, HEADER + vBytes + tBytes)
  const solver = JSON.parse(bytes.toString('utf8', HEADER + vBytes + tBytes)) as SolverReport
  return { vertices, triangles, solver }
}
