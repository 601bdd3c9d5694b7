import { describe, expect, it } from 'vitest'
import * as THREE from 'three'
import { DEFAULT_SNAP_STEP, heightFromDrag, snapPlan, snapValue } from '../../src/lib/snapping'
import { holeRing, nearestPoint2D, nearestSegment2D, rayPlaneZ } from '../../src/components/workbench/picking'

describe('snapping', () => {
  it('snaps to the nearest multiple of the step and prints cleanly', () => {
    expect(DEFAULT_SNAP_STEP).toBe(0.1)
    expect(snapValue(0.26, 0.1)).toBe(0.3)
    expect(snapValue(0.24, 0.1)).toBe(0.2)
    expect(snapValue(-1.04, 0.1)).toBe(-1)
    expect(snapValue(2.6, 0.25)).toBe(2.5)
    expect(String(snapValue(0.3, 0.1))).toBe('0.3')
  })

  it('leaves values alone for a non-positive step or a non-finite value', () => {
    expect(snapValue(0.1234, 0)).toBe(0.1234)
    expect(snapValue(0.1234, -1)).toBe(0.1234)
    expect(Number.isNaN(snapValue(Number.NaN, 0.1))).toBe(true)
  })

  it('snaps a plan position only when on', () => {
    expect(snapPlan({ x: 1.23, y: 4.56 }, 0.1, true)).toEqual({ x: 1.2, y: 4.6 })
    expect(snapPlan({ x: 1.23, y: 4.56 }, 0.1, false)).toEqual({ x: 1.23, y: 4.56 })
  })

  it('raises a point when the pointer moves up (screen y down is positive)', () => {
    // 40 px up at 0.01 m/px = +0.4 m
    expect(heightFromDrag(2, -40, 0.01, 0.1, true)).toBe(2.4)
    expect(heightFromDrag(2, 23, 0.01, 0.1, false)).toBe(1.77)
    expect(heightFromDrag(2, 23, 0.01, 0.1, true)).toBe(1.8)
  })
})

describe('picking', () => {
  it('meets the plane z = h where three.js Ray.intersectPlane does (reference library)', () => {
    const cases: [THREE.Vector3, THREE.Vector3, number][] = [
      [new THREE.Vector3(3, -4, 20), new THREE.Vector3(0.1, 0.2, -1).normalize(), 1.5],
      [new THREE.Vector3(-2, 7, 0.5), new THREE.Vector3(0.3, -0.4, 0.8).normalize(), 3],
      [new THREE.Vector3(0, 0, 10), new THREE.Vector3(0, 0, -1), 0],
    ]
    for (const [origin, dir, h] of cases) {
      const expected = new THREE.Ray(origin, dir).intersectPlane(
        new THREE.Plane(new THREE.Vector3(0, 0, 1), -h),
        new THREE.Vector3(),
      )
      const got = rayPlaneZ(origin, dir, h)
      expect(expected).not.toBeNull()
      expect(got!.x).toBeCloseTo(expected!.x, 9)
      expect(got!.y).toBeCloseTo(expected!.y, 9)
    }
  })

  it('misses a plane the ray runs parallel to or points away from', () => {
    expect(rayPlaneZ({ x: 0, y: 0, z: 5 }, { x: 1, y: 0, z: 0 }, 0)).toBeNull()
    expect(rayPlaneZ({ x: 0, y: 0, z: 5 }, { x: 0, y: 0, z: 1 }, 0)).toBeNull()
  })

  it('finds the nearest segment with the parameter three.js Line3 gives (reference library)', () => {
    const segments = [
      { a: { x: 0, y: 0 }, b: { x: 100, y: 0 } },
      { a: { x: 100, y: 0 }, b: { x: 100, y: 100 } },
    ]
    const p = { x: 30, y: 6 }
    const hit = nearestSegment2D(p, segments, 10)
    const line = new THREE.Line3(new THREE.Vector3(0, 0, 0), new THREE.Vector3(100, 0, 0))
    expect(hit?.index).toBe(0)
    expect(hit!.t).toBeCloseTo(line.closestPointToPointParameter(new THREE.Vector3(30, 6, 0), true), 12)
    expect(hit!.distance).toBeCloseTo(6, 12)
    expect(nearestSegment2D({ x: 50, y: 50 }, segments, 10)).toBeNull()
    expect(nearestSegment2D({ x: 97, y: 40 }, segments, 10)?.index).toBe(1)
  })

  it('picks the nearest handle within the tolerance only', () => {
    const pts = [
      { x: 10, y: 10 },
      { x: 14, y: 10 },
      { x: 100, y: 100 },
    ]
    expect(nearestPoint2D({ x: 13, y: 11 }, pts, 12)?.index).toBe(1)
    expect(nearestPoint2D({ x: 50, y: 50 }, pts, 12)).toBeNull()
  })

  it('lays a hole ring on its circle, clockwise seen from above like the starter holes', () => {
    const ring = holeRing({ x: 4, y: 3 }, 0.5, 2.2, 8)
    expect(ring).toHaveLength(8)
    for (const p of ring) {
      expect(Math.hypot(p.x - 4, p.y - 3)).toBeCloseTo(0.5, 2)
      expect(p.z).toBe(2.2)
    }
    // shoelace formula: negative signed area = clockwise; a regular octagon of circumradius r
    // has area 2·√2·r² (handbook polygon area, n/2·r²·sin(2π/n))
    let twice = 0
    ring.forEach((p, i) => {
      const q = ring[(i + 1) % ring.length]!
      twice += p.x * q.y - q.x * p.y
    })
    expect(twice / 2).toBeCloseTo(-2 * Math.SQRT2 * 0.25, 2)
  })
})
