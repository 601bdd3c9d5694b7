import { beforeEach, describe, expect, it } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import * as THREE from 'three'
import type { Pin } from '../../src/api/team'
import { buildPinMarkers, PIN_COLOURS, usePinMarkers } from '../../src/composables/use-pin-markers'
import { usePinsStore } from '../../src/stores/pins'

const pin = (id: string, x: number, y: number, z: number, resolved = false): Pin => ({
  id,
  x,
  y,
  z,
  docVersion: 3,
  body: id,
  resolved,
  author: { id: 'u', name: 'U' },
  createdAt: '2026-01-01T00:00:00.000Z',
  updatedAt: '2026-01-01T00:00:00.000Z',
  replies: [],
})

describe('pin markers', () => {
  beforeEach(() => setActivePinia(createPinia()))

  // Geometry is float32 in three.js: positions are good to about 1e-7 m.
  it('puts the cone tip on the pinned point and the base one marker size above it', () => {
    const group = buildPinMarkers([pin('a', 2, -1, 3.5)], null, 0.4)
    group.updateMatrixWorld(true)
    const box = new THREE.Box3().setFromObject(group)
    expect(box.min.z).toBeCloseTo(3.5, 6)
    expect(box.max.z).toBeCloseTo(3.9, 6)
    expect((box.min.x + box.max.x) / 2).toBeCloseTo(2, 6)
    expect((box.min.y + box.max.y) / 2).toBeCloseTo(-1, 6)
  })

  it('dims resolved pins and colours open ones in the open colour', () => {
    const group = buildPinMarkers([pin('open', 0, 0, 0), pin('done', 1, 0, 0, true)], null, 0.3)
    const [open, done] = group.children.map((m) => (m as THREE.Mesh).material as THREE.MeshStandardMaterial)
    expect(`#${open!.color.getHexString(THREE.SRGBColorSpace)}`).toBe(PIN_COLOURS.open)
    expect(open!.opacity).toBe(1)
    expect(done!.opacity).toBeLessThan(1)
  })

  // three.js Raycaster: a ray through a marker's projection hits that marker; empty space hits none.
  it('tells which marker is under a point of the screen, following the store', () => {
    const store = usePinsStore()
    store.pins = [pin('left', -3, 0, 0), pin('right', 3, 0, 0)]
    const scene = new THREE.Scene()
    const camera = new THREE.PerspectiveCamera(45, 1, 0.1, 100)
    camera.position.set(0, 0, 20)
    camera.lookAt(0, 0, 0)
    camera.updateMatrixWorld(true)
    const markers = usePinMarkers(scene, camera, { size: 0.6 })
    scene.updateMatrixWorld(true)
    const at = (x: number, y: number, z: number) => {
      const v = new THREE.Vector3(x, y, z).project(camera)
      return { x: v.x, y: v.y }
    }
    expect(markers.pick(at(-3, 0, 0.3))).toBe('left')
    expect(markers.pick(at(3, 0, 0.3))).toBe('right')
    expect(markers.pick(at(0, 5, 0))).toBeNull()
    markers.dispose()
    expect(scene.getObjectByName('pin-markers')).toBeUndefined()
  })
})
