/**
 * Property: whatever is handed to the frame reader (a file's JSON, or values read back from the
 * shared document, where yjs keeps NaN and Infinity), the answer is a Frame or a FrameError that
 * names a field and a reason: never another exception, never a frame holding a non-finite number.
 * The contract is PRODUCT.md "Frame file" ("a clear error names the field and the reason").
 */
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { FrameError, parseFrameJson } from '../../shared/frame/index.js'

const codes = new Set([
  'invalid-json',
  'invalid-field',
  'not-finite',
  'unknown-edge-kind',
  'too-few-points',
  'repeated-point',
  'duplicate-id',
  'degenerate-loop',
  'self-crossing',
  'hole-outside',
  'loops-crossing',
  'spatial-frame',
  'outer-loop-count',
  'cable-tension',
  'prestress',
  'edge-length',
  'too-many-points',
  'mesh-too-fine',
  'csv-syntax',
])

// Mostly plausible numbers, sometimes the values that break geometry code.
const num = fc.oneof(
  { weight: 8, arbitrary: fc.double({ min: -20, max: 20, noNaN: true }) },
  { weight: 1, arbitrary: fc.constantFrom(Number.NaN, Infinity, -Infinity, 0, -0, 1e308, 5e-324) },
  { weight: 1, arbitrary: fc.oneof(fc.string({ maxLength: 4 }), fc.constant(null), fc.boolean()) },
)
const point = fc.record(
  { id: fc.option(fc.string({ minLength: 1, maxLength: 3 }), { nil: undefined }), x: num, y: num, z: num },
  { requiredKeys: ['x', 'y', 'z'] },
)
const edge = fc.oneof(
  fc.record({ kind: fc.constant('rigid') }),
  fc.record({ kind: fc.constant('cable'), tension: num }),
  fc.record({ kind: fc.string({ maxLength: 5 }) }),
)
const loop = fc.record(
  {
    role: fc.oneof(
      { weight: 6, arbitrary: fc.constantFrom('outer', 'hole') },
      { weight: 1, arbitrary: fc.string({ maxLength: 5 }) },
    ),
    points: fc.array(point, { maxLength: 9 }),
    edges: fc.array(edge, { maxLength: 9 }),
  },
  { requiredKeys: ['role', 'points'] },
)
const frameLike = fc.record(
  {
    format: fc.constantFrom('veilroom-frame', 'other'),
    prestress: fc.record({ warp: num, fill: num }),
    mesh: fc.record({ edgeLength: fc.oneof(fc.double({ min: 0.2, max: 3, noNaN: true }), num) }),
    loops: fc.array(loop, { maxLength: 3 }),
  },
  { requiredKeys: ['loops'] },
)

// A star-shaped outer loop (simple by construction) with at most one value corrupted: mostly valid
// frames, and the refusals they provoke sit right next to valid input.
const nearValid = fc
  .record({
    radii: fc.array(fc.double({ min: 1, max: 6, noNaN: true }), { minLength: 3, maxLength: 9 }),
    z: fc.double({ min: -3, max: 3, noNaN: true }),
    cable: fc.boolean(),
    corrupt: fc.option(fc.record({ index: fc.nat(8), key: fc.constantFrom('x', 'y', 'z'), value: num }), {
      nil: null,
      freq: 2,
    }),
  })
  .map(({ radii, z, cable, corrupt }) => {
    const n = radii.length
    const points: Record<string, unknown>[] = radii.map((r, i) => ({
      x: r * Math.cos((2 * Math.PI * i) / n),
      y: r * Math.sin((2 * Math.PI * i) / n),
      z: i % 2 ? z : 0,
    }))
    if (corrupt) points[corrupt.index % n]![corrupt.key] = corrupt.value
    const edges = points.map(() => (cable ? { kind: 'cable', tension: 20 } : { kind: 'rigid' }))
    return { format: 'veilroom-frame', mesh: { edgeLength: 0.5 }, loops: [{ role: 'outer', points, edges }] }
  })

function allFinite(value: unknown): boolean {
  if (typeof value === 'number') return Number.isFinite(value)
  if (Array.isArray(value)) return value.every(allFinite)
  if (value && typeof value === 'object') return Object.values(value).every(allFinite)
  return true
}

const seen = { frames: 0, refusals: 0 }

/** Frame or named FrameError; anything else fails the property. */
function readOrRefuse(input: unknown): void {
  try {
    const frame = parseFrameJson(input)
    seen.frames++
    expect(frame.loops.length).toBeGreaterThan(0)
    expect(allFinite(frame)).toBe(true)
  } catch (err) {
    if (!(err instanceof FrameError))
      throw new Error(`not a FrameError: ${String(err)} for ${JSON.stringify(input)}`, { cause: err })
    seen.refusals++
    expect(codes.has(err.code)).toBe(true)
    expect(err.field.length).toBeGreaterThan(0)
    expect(err.reason.length).toBeGreaterThan(0)
  }
}

describe('frame reader on random input', () => {
  it('returns a finite Frame or throws a FrameError naming field and reason (frame-shaped input)', () => {
    fc.assert(fc.property(fc.oneof(frameLike, nearValid), readOrRefuse), { numRuns: 800, seed: 20261202 })
    // Both branches were exercised, or the property says little.
    expect(seen.frames).toBeGreaterThan(20)
    expect(seen.refusals).toBeGreaterThan(100)
  })

  it('does the same for arbitrary JSON values and for text', () => {
    fc.assert(fc.property(fc.jsonValue({ maxDepth: 4 }), readOrRefuse), { numRuns: 300, seed: 7 })
    fc.assert(fc.property(fc.string({ maxLength: 60 }), readOrRefuse), { numRuns: 200, seed: 11 })
  })
})
