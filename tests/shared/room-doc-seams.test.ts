/** The room document's seams: edits, and a reader that checks shape and never throws. */
import { describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { cutsForSurface } from '../../shared/pattern'
import {
  addSeamFamily,
  patternMap,
  readRoomCuts,
  removeSeamFamily,
  setCutSettings,
  updateSeamFamily,
} from '../../shared/room-doc/seams'

describe('room document seams', () => {
  it('reads nothing from a room without seams, then the families and settings people wrote', () => {
    const doc = new Y.Doc()
    expect(readRoomCuts(doc)).toBeNull()
    const id = addSeamFamily(doc, { kind: 'parallel', angle: 90, spacing: 2, offset: 0 })
    addSeamFamily(doc, { kind: 'geodesic', from: [0, 0, 0], to: [6, 6, 0] })
    setCutSettings(doc, { rollWidth: 1.8, compensationWarp: 1.5 })
    const read = readRoomCuts(doc, 30)
    expect(read).toMatchObject({
      ok: true,
      cuts: { settings: { warpAngle: 30, rollWidth: 1.8, compensation: { warp: 1.5, fill: 0 } } },
    })
    expect(read?.ok && read.cuts.families.map((f) => f.kind)).toEqual(['parallel', 'geodesic'])
    updateSeamFamily(doc, id, { spacing: 1.5 })
    setCutSettings(doc, { warpAngle: 10 })
    const again = readRoomCuts(doc, 30)
    expect(again?.ok && again.cuts.families[0]).toMatchObject({ spacing: 1.5 })
    expect(again?.ok && again.cuts.settings.warpAngle).toBe(10)
    expect(removeSeamFamily(doc, id)).toBe(true)
    expect(removeSeamFamily(doc, id)).toBe(false)
  })

  it('answers a named error for any malformed shape instead of throwing', () => {
    const doc = new Y.Doc()
    addSeamFamily(doc, { kind: 'parallel', angle: 0, spacing: 2, offset: 0 })
    const family = (patternMap(doc).get('families') as Y.Array<Y.Map<unknown>>).get(0)
    family.set('spacing', Number.NaN)
    expect(readRoomCuts(doc)).toMatchObject({ ok: false, field: 'pattern.families[0].spacing' })
    family.set('spacing', 'wide')
    expect(readRoomCuts(doc)).toMatchObject({ ok: false, field: 'pattern.families[0].spacing' })
    family.set('spacing', 2)
    family.set('kind', 'spiral')
    expect(readRoomCuts(doc)).toMatchObject({ ok: false, field: 'pattern.families[0].kind' })
    patternMap(doc).set('families', 'not a list')
    expect(readRoomCuts(doc)).toMatchObject({ ok: false, field: 'pattern.families' })
    patternMap(doc).set('families', new Y.Array())
    ;(patternMap(doc).get('families') as Y.Array<unknown>).push([42])
    expect(readRoomCuts(doc)).toMatchObject({ ok: false, field: 'pattern.families[0]' })
    patternMap(doc).set('families', new Y.Array())
    ;(patternMap(doc).get('families') as Y.Array<unknown>).push([
      { id: 'x', kind: 'radial', x: 0, y: 0, count: 2, startAngle: 0 },
    ])
    patternMap(doc).set('settings', 'wide')
    expect(readRoomCuts(doc)).toMatchObject({ ok: true })
    setCutSettings(doc, { compensationFill: -3 })
    expect(readRoomCuts(doc)).toMatchObject({ ok: false, field: 'pattern.settings.compensationFill' })
  })

  it('expands families into planes across the surface (parallel) and round a mast (radial)', () => {
    // a 10 m × 4 m surface from x = 0: parallel planes normal to +x every 3 m at x = 3, 6, 9
    const vertices = [0, 0, 0, 10, 0, 0, 10, 4, 1, 0, 4, 1]
    const settings = { warpAngle: 0, compensation: { warp: 0, fill: 0 }, seamAllowance: 0, rollWidth: 2.5 }
    const parallel = cutsForSurface(
      { settings, families: [{ id: 'a', kind: 'parallel', angle: 0, spacing: 3, offset: 0 }] },
      vertices,
    )
    expect(parallel.settings.seams.map((s) => s.kind === 'plane' && s.point[0])).toEqual([3, 6, 9])
    const radial = cutsForSurface(
      { settings, families: [{ id: 'b', kind: 'radial', x: 5, y: 2, count: 3, startAngle: 0 }] },
      vertices,
    )
    expect(radial.settings.seams).toHaveLength(3)
    expect(radial.settings.warpCentre).toEqual([5, 2])
    expect(radial.familyOfSeam).toEqual([0, 0, 0])
  })
})
