import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { roomWithCast, startTeamworkServer, type RoomCast, type TeamworkServer } from './teamwork-helpers.js'

let tw: TeamworkServer
let cast: RoomCast
beforeAll(async () => {
  tw = await startTeamworkServer()
  cast = await roomWithCast(tw, 'Pins test room')
})
afterAll(async () => {
  await tw?.stop()
})

const pinsPath = () => `/api/rooms/${cast.roomId}/pins`
const newPin = (body = 'Edge cable looks slack near the mast') => ({ x: 1.25, y: -2.5, z: 3.75, docVersion: 12, body })

describe('pins', () => {
  it('creates a pin with author and times, and tells the room (pin:changed)', async () => {
    const reply = await cast.clients.reviewer.post(pinsPath(), newPin())
    expect(reply.status).toBe(201)
    expect(reply.body.pin).toMatchObject({
      ...newPin(),
      resolved: false,
      author: { id: cast.ids.reviewer, name: 'Reviewer Person' },
      replies: [],
    })
    expect(Date.parse(reply.body.pin.createdAt)).toBeGreaterThan(Date.now() - 60_000)
    expect(tw.live.emitted.at(-1)).toEqual({
      roomId: cast.roomId,
      event: 'pin:changed',
      payload: { roomId: cast.roomId, pin: reply.body.pin },
    })
  })

  it('threads replies, lets only the author edit text and only editors resolve', async () => {
    const { pin } = (await cast.clients.reviewer.post(pinsPath(), newPin('Check drainage at the low corner'))).body
    const replied = await cast.clients.editor.post(`${pinsPath()}/${pin.id}/replies`, {
      body: 'Agreed, adding a fall.',
    })
    expect(replied.status).toBe(201)
    expect(replied.body.pin.replies).toEqual([
      {
        id: expect.any(String),
        body: 'Agreed, adding a fall.',
        author: { id: cast.ids.editor, name: 'Editor Person' },
        createdAt: expect.any(String),
      },
    ])

    expect((await cast.clients.editor.patch(`${pinsPath()}/${pin.id}`, { body: 'hijacked' })).status).toBe(403)
    expect((await cast.clients.reviewer.patch(`${pinsPath()}/${pin.id}`, { resolved: true })).status).toBe(403)
    const edited = await cast.clients.reviewer.patch(`${pinsPath()}/${pin.id}`, {
      body: 'Check drainage at the south-west corner',
    })
    expect(edited.body.pin.body).toBe('Check drainage at the south-west corner')
    const resolved = await cast.clients.editor.patch(`${pinsPath()}/${pin.id}`, { resolved: true })
    expect(resolved.body.pin.resolved).toBe(true)
    expect(Date.parse(resolved.body.pin.updatedAt)).toBeGreaterThanOrEqual(Date.parse(pin.updatedAt))

    const open = await cast.clients.viewer.get(`${pinsPath()}?status=open`)
    expect(open.body.pins.map((p: { id: string }) => p.id)).not.toContain(pin.id)
    const done = await cast.clients.viewer.get(`${pinsPath()}?status=resolved`)
    expect(done.body.pins.map((p: { id: string }) => p.id)).toEqual([pin.id])
  })

  it('filters mine=1 and deletes only for the author (pin:deleted)', async () => {
    const { pin } = (await cast.clients.editor.post(pinsPath(), newPin('Mast head too low?'))).body
    const mine = await cast.clients.editor.get(`${pinsPath()}?status=all&mine=1`)
    expect(mine.body.pins.every((p: { author: { id: string } }) => p.author.id === cast.ids.editor)).toBe(true)
    expect(mine.body.pins.map((p: { id: string }) => p.id)).toContain(pin.id)
    expect((await cast.clients.owner.delete(`${pinsPath()}/${pin.id}`)).status).toBe(403)
    expect((await cast.clients.editor.delete(`${pinsPath()}/${pin.id}`)).status).toBe(204)
    expect(tw.live.emitted.at(-1)).toEqual({
      roomId: cast.roomId,
      event: 'pin:deleted',
      payload: { roomId: cast.roomId, pinId: pin.id },
    })
    expect((await cast.clients.editor.delete(`${pinsPath()}/${pin.id}`)).body.error.code).toBe('pin_not_found')
  })

  it('refuses bad input naming the field', async () => {
    const nan = await cast.clients.reviewer.request('POST', pinsPath(), { ...newPin(), x: 'NaN' })
    expect(nan.status).toBe(400)
    expect(nan.body.error.field).toBe('x')
    const empty = await cast.clients.reviewer.post(pinsPath(), { ...newPin(), body: '   ' })
    expect(empty.body.error.field).toBe('body')
    const version = await cast.clients.reviewer.post(pinsPath(), { ...newPin(), docVersion: 1.5 })
    expect(version.body.error.field).toBe('docVersion')
    const status = await cast.clients.reviewer.get(`${pinsPath()}?status=closed`)
    expect(status.body.error.field).toBe('status')
  })
})
