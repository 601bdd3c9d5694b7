import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { solveFrame } from '../../shared/engine.js'
import { parseFrameJson } from '../../shared/frame/index.js'
import type { Frame } from '../../shared/types.js'
import {
  engineLive,
  roomWithCast,
  startTeamworkServer,
  type RoomCast,
  type TeamworkServer,
} from './teamwork-helpers.js'

// Scherk's first surface u = ln(cos y / cos x) over [−1, 1]²: area 5.69751221 (H. F. Scherk 1835,
// value from /work/shared/CHECKS.md). The frame samples the exact boundary heights, shifted off the
// origin to (10, 20) and lifted by 2 m.
function scherkFrame(perSide = 40): Frame {
  const u = (x: number, y: number) => Math.log(Math.cos(y) / Math.cos(x))
  const points: { id: string; x: number; y: number; z: number }[] = []
  const corners = [
    [-1, -1],
    [1, -1],
    [1, 1],
    [-1, 1],
  ] as const
  for (let side = 0; side < 4; side++) {
    const [ax, ay] = corners[side]!
    const [bx, by] = corners[(side + 1) % 4]!
    for (let k = 0; k < perSide; k++) {
      const t = k / perSide
      // The corners are singular (u → ±∞ is not reached at |x| = |y| = 1, but u(±1, ±1) = 0): fine.
      const x = ax + (bx - ax) * t
      const y = ay + (by - ay) * t
      points.push({ id: `s${side}k${k}`, x: 10 + x, y: 20 + y, z: 2 + u(x, y) })
    }
  }
  return parseFrameJson({
    prestress: { warp: 2, fill: 2 },
    mesh: { edgeLength: 0.08 },
    loops: [{ role: 'outer', points }],
  })
}

const engine = engineLive((f) => solveFrame(f))
let tw: TeamworkServer
let cast: RoomCast
beforeAll(async () => {
  tw = await startTeamworkServer(engine.live)
  cast = await roomWithCast(tw, 'Scherk roof — Café "Nord/Süd"')
})
afterAll(async () => {
  await tw?.stop()
})

const snaps = () => `/api/rooms/${cast.roomId}/snapshots`

describe('snapshots', () => {
  it('refuses to save without a frame or without a settled surface for the latest edit (409)', async () => {
    engine.setFrame(null, { settle: false })
    expect((await cast.clients.editor.post(snaps(), { name: 'empty' })).body.error.code).toBe('no_frame')
    engine.setFrame(scherkFrame(), { settle: false })
    const none = await cast.clients.editor.post(snaps(), { name: 'too early' })
    expect(none.status).toBe(409)
    expect(none.body.error).toMatchObject({ code: 'no_surface', message: expect.stringMatching(/settled/) })
  })

  it('saves frame + surface + figures, and gives them back unchanged', async () => {
    const frame = scherkFrame()
    engine.setFrame(frame)
    const live = (await engine.live.getLatestSurface())!
    const saved = await cast.clients.editor.post(snaps(), { name: 'Scherk, 40 points a side', note: 'baseline' })
    expect(saved.status).toBe(201)
    const { snapshot } = saved.body
    expect(snapshot).toMatchObject({
      name: 'Scherk, 40 points a side',
      note: 'baseline',
      author: { id: cast.ids.editor, name: 'Editor Person' },
    })
    expect(snapshot.figures.cableCount).toBe(0)
    // The exact area is 5.69751221 (CHECKS.md); sampled boundary and linear elements stay within 0.5 %.
    expect(snapshot.figures.area).toBeCloseTo(5.69751221, 1)
    expect(Math.abs(snapshot.figures.area / 5.69751221 - 1)).toBeLessThan(0.005)
    expect(snapshot.figures.planArea).toBeCloseTo(4, 6)

    const list = await cast.clients.viewer.get(snaps())
    expect(list.body.snapshots[0]).toEqual(snapshot)
    const detail = await cast.clients.viewer.get(`${snaps()}/${snapshot.id}`)
    expect(detail.body.snapshot.frame).toEqual(frame)
    expect(detail.body.snapshot.figures).toEqual(live.figures)

    const surface = await cast.clients.viewer.get(`${snaps()}/${snapshot.id}/surface`)
    expect(surface.body.caution).toMatch(/preliminary/)
    expect(surface.body.solver).toEqual(live.solver)
    expect(surface.body.triangles.flat()).toEqual([...live.triangles])
    const flat: number[] = surface.body.vertices.flat()
    expect(flat).toHaveLength(live.vertices.length)
    flat.forEach((v, i) => expect(Math.abs(v - live.vertices[i]!)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(v))))

    // Area of the stored mesh by summing triangle areas (½|AB × AC|, elementary geometry) matches the stored figure.
    const V = surface.body.vertices as [number, number, number][]
    let area = 0
    for (const [a, b, c] of surface.body.triangles as [number, number, number][]) {
      const [p, q, r] = [V[a]!, V[b]!, V[c]!]
      const u = [q[0] - p[0], q[1] - p[1], q[2] - p[2]],
        w = [r[0] - p[0], r[1] - p[1], r[2] - p[2]]
      area +=
        0.5 * Math.hypot(u[1]! * w[2]! - u[2]! * w[1]!, u[2]! * w[0]! - u[0]! * w[2]!, u[0]! * w[1]! - u[1]! * w[0]!)
    }
    expect(area).toBeCloseTo(snapshot.figures.area, 4)
  })

  it('gives the current settled state with the frame it was solved from (for an unsaved report)', async () => {
    const frame = scherkFrame(20)
    engine.setFrame(frame)
    const live = (await engine.live.getLatestSurface())!
    const current = await cast.clients.viewer.get(`/api/rooms/${cast.roomId}/surface`)
    expect(current.status).toBe(200)
    expect(current.body.frame).toEqual(frame)
    expect(current.body.figures).toEqual(live.figures)
    expect(current.body.solver).toEqual(live.solver)
    expect(current.body.triangles).toHaveLength(live.triangles.length / 3)
    expect(current.body.caution).toMatch(/preliminary/)
  })

  it('refuses when the latest edit is not settled yet, and deletes (editor and up)', async () => {
    engine.setFrame(scherkFrame(20))
    const ok = await cast.clients.owner.post(snaps(), { name: 'coarse boundary' })
    expect(ok.status).toBe(201)
    engine.setFrame(scherkFrame(30), { settle: false })
    const stale = await cast.clients.owner.post(snaps(), { name: 'stale' })
    expect(stale.status).toBe(409)
    expect(stale.body.error.code).toBe('no_surface')
    // The unsaved report's source refuses the same way: its frame table would not match its surface.
    expect((await cast.clients.viewer.get(`/api/rooms/${cast.roomId}/surface`)).body.error.code).toBe('no_surface')
    expect((await cast.clients.reviewer.delete(`${snaps()}/${ok.body.snapshot.id}`)).status).toBe(403)
    expect((await cast.clients.editor.delete(`${snaps()}/${ok.body.snapshot.id}`)).status).toBe(204)
    expect((await cast.clients.viewer.get(`${snaps()}/${ok.body.snapshot.id}`)).body.error.code).toBe(
      'snapshot_not_found',
    )
  })

  it('validates the name, naming the field', async () => {
    const reply = await cast.clients.editor.post(snaps(), { name: '', note: 'x' })
    expect(reply.status).toBe(400)
    expect(reply.body.error.field).toBe('name')
  })
})
