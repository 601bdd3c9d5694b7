import { describe, expect, it } from 'vitest'
import * as THREE from 'three'
import {
  FLAT_CLASSES,
  HEIGHT_RAMP,
  SLOPE_SPAN,
  hexToRgb,
  rampColour,
  rampCss,
  srgbToLinear,
  surfaceColours,
  vertexSlopes,
} from '../../src/lib/colour-maps'

/** A grid of (n+1)² vertices over [0, size]² with z = f(x, y), two triangles per cell. */
function gridSurface(n: number, size: number, f: (x: number, y: number) => number) {
  const vertices = new Float32Array((n + 1) * (n + 1) * 3)
  for (let j = 0; j <= n; j++) {
    for (let i = 0; i <= n; i++) {
      const x = (i / n) * size
      const y = (j / n) * size
      vertices.set([x, y, f(x, y)], (j * (n + 1) + i) * 3)
    }
  }
  const tris: number[] = []
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const a = j * (n + 1) + i
      tris.push(a, a + 1, a + n + 2, a, a + n + 2, a + n + 1)
    }
  }
  return { vertices, triangles: new Uint32Array(tris) }
}

describe('colour conversion', () => {
  it('converts sRGB to linear as three.js does (reference library)', () => {
    for (const hex of ['#24484d', '#d8bf94', '#b4553d', '#f6ecd6', '#000000', '#ffffff']) {
      const reference = new THREE.Color(hex) // three.js converts sRGB hex into its linear working space
      const [r, g, b] = hexToRgb(hex).map(srgbToLinear) as [number, number, number]
      expect(r).toBeCloseTo(reference.r, 6)
      expect(g).toBeCloseTo(reference.g, 6)
      expect(b).toBeCloseTo(reference.b, 6)
    }
  })

  it('hits the stops exactly and interpolates between them', () => {
    expect(rampColour(HEIGHT_RAMP, 0)).toEqual(hexToRgb('#24484d'))
    expect(rampColour(HEIGHT_RAMP, 1)).toEqual(hexToRgb('#f6ecd6'))
    expect(rampColour(HEIGHT_RAMP, -3)).toEqual(hexToRgb('#24484d'))
    const mid = rampColour(HEIGHT_RAMP, 0.35 / 2)
    const [a, b] = [hexToRgb('#24484d'), hexToRgb('#4f8a86')]
    mid.forEach((c, i) => expect(c).toBeCloseTo((a[i]! + b[i]!) / 2, 9))
    expect(rampCss(HEIGHT_RAMP)).toBe('linear-gradient(to right, #24484d 0%, #4f8a86 35%, #d8bf94 70%, #f6ecd6 100%)')
  })
})

describe('vertex slopes', () => {
  it('gives atan(gradient) on an inclined plane (slope angle of z = g·x is atan g)', () => {
    for (const g of [0, 0.1, 0.5, 1, 3]) {
      const { vertices, triangles } = gridSurface(6, 4, (x) => g * x)
      const slopes = vertexSlopes(new Float32Array(vertices.length / 3), vertices, triangles)
      const expected = (Math.atan(g) * 180) / Math.PI
      for (const s of slopes) expect(s).toBeCloseTo(expected, 3)
    }
  })

  it('converges to atan(|∇z|) at second order on a curved surface (z = x³/12 + y²/8)', () => {
    // at (3, 2): ∇z = (x²/4, y/4) = (2.25, 0.5), slope = atan(|∇z|) ≈ 66.55°
    const exact = (Math.atan(Math.hypot(2.25, 0.5)) * 180) / Math.PI
    const errorAt = (n: number): number => {
      const { vertices, triangles } = gridSurface(n, 4, (x, y) => (x * x * x) / 12 + (y * y) / 8)
      const slopes = vertexSlopes(new Float32Array(vertices.length / 3), vertices, triangles)
      return Math.abs(slopes[(n / 2) * (n + 1) + (3 * n) / 4]! - exact)
    }
    expect(errorAt(16)).toBeLessThan(0.1)
    // halving h twice should cut an O(h²) error about 16×; ask for 8× to leave room
    expect(errorAt(32)).toBeLessThan(errorAt(8) / 8)
  })
})

describe('surface colours', () => {
  it('maps height from the lowest to the highest vertex', () => {
    const { vertices, triangles } = gridSurface(4, 4, (x) => 1 + 0.5 * x)
    const out = new Float32Array(vertices.length)
    const range = surfaceColours(out, vertices, triangles, 'height', 5)
    expect(range.min).toBeCloseTo(1, 6)
    expect(range.max).toBeCloseTo(3, 6)
    const low = hexToRgb(HEIGHT_RAMP[0]!.hex).map(srgbToLinear)
    low.forEach((c, i) => expect(out[i]).toBeCloseTo(c, 6))
  })

  it('classes a 3° plane as flat, an 8° plane as shallow and a 20° plane as draining at a 5° threshold', () => {
    const classOf = (deg: number): number => {
      const g = Math.tan((deg * Math.PI) / 180)
      const { vertices, triangles } = gridSurface(3, 3, (x) => g * x)
      const out = new Float32Array(vertices.length)
      surfaceColours(out, vertices, triangles, 'flat', 5)
      return FLAT_CLASSES.findIndex((c) =>
        hexToRgb(c.hex)
          .map(srgbToLinear)
          .every((v, i) => Math.abs(v - out[i]!) < 1e-6),
      )
    }
    expect([classOf(3), classOf(8), classOf(20)]).toEqual([0, 1, 2])
  })

  it('reports the fixed slope span for the slope legend', () => {
    const { vertices, triangles } = gridSurface(2, 2, () => 0)
    expect(surfaceColours(new Float32Array(vertices.length), vertices, triangles, 'slope', 5)).toEqual({
      min: 0,
      max: SLOPE_SPAN,
    })
  })
})
