/**
 * The server-side accessors other modules use (LiveRoomPort, server/realtime/README.md): the frame and
 * version of a room, the last settled surface (solved on demand after a restart), broadcasts, and
 * closing a member's sockets when their access changes.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { starterFrame } from '../../shared/room-doc/starters.js'
import { connectDoc, connectStream, makeRoom, signedInUser, startLive, until, type Live } from './live-helpers.js'

let live: Live
let owner: { id: string; cookie: string }
let guest: { id: string; cookie: string }

beforeAll(async () => {
  live = await startLive()
  owner = await signedInUser(live, 'Holder')
  guest = await signedInUser(live, 'Guest')
})

afterAll(async () => {
  await live?.stop()
})

describe('realtime accessors', () => {
  it('reads the frame and version of a room that is not open, seeding its starter first', async () => {
    const roomId = await makeRoom(live.running.dataSource, [{ userId: owner.id, role: 'owner' }])
    expect(await live.realtime.ensureRoomFrame(roomId, 'tent')).toBe(true)
    const { frame, version } = await live.realtime.getRoomFrame(roomId)
    expect(version).toBe(1)
    const tent = starterFrame('tent')
    expect(frame?.loops.map((l) => [l.role, l.points.length])).toEqual(tent.loops.map((l) => [l.role, l.points.length]))
    expect(frame?.prestress).toEqual(tent.prestress)
  })

  it('solves on demand when asked for the surface of a room nobody has open', async () => {
    const roomId = await makeRoom(live.running.dataSource, [{ userId: owner.id, role: 'owner' }])
    await live.realtime.ensureRoomFrame(roomId, 'blank')
    const surface = await live.realtime.getLatestSurface(roomId)
    expect(surface).not.toBeNull()
    expect(surface!.version).toBe(1)
    expect(surface!.solver.converged).toBe(true)
    // A flat square frame spans a flat membrane: area = plan area = 36 m² (elementary geometry).
    expect(surface!.figures.area).toBeCloseTo(36, 6)
    expect(surface!.vertices.length % 3).toBe(0)
  }, 90_000)

  it("closes a removed member's sync and stream sockets, and nobody else's", async () => {
    const roomId = await makeRoom(live.running.dataSource, [
      { userId: owner.id, role: 'owner' },
      { userId: guest.id, role: 'editor' },
    ])
    const ownerDoc = connectDoc(live.url, roomId, owner.cookie)
    const guestDoc = connectDoc(live.url, roomId, guest.cookie)
    await Promise.all([ownerDoc.synced, guestDoc.synced])
    const guestStream = connectStream(live.url, guest.cookie)
    expect(await guestStream.timeout(10_000).emitWithAck('room:join', { roomId })).toMatchObject({ ok: true })
    const closes: number[] = []
    guestDoc.provider.on('connection-close', (event: { code?: number } | null) => closes.push(event?.code ?? 0))
    let ownerClosed = false
    ownerDoc.provider.on('connection-close', () => (ownerClosed = true))
    guestDoc.provider.shouldConnect = false

    live.realtime.closeRoomSockets(roomId, guest.id)
    await until(() => closes.length > 0 && guestStream.disconnected, 5000, 'guest sockets closed')
    expect(closes[0]).toBe(4403)
    expect(ownerClosed).toBe(false)
    ownerDoc.destroy()
    guestDoc.destroy()
    guestStream.close()
  })

  it('broadcasts an event to the sockets that joined the room', async () => {
    const roomId = await makeRoom(live.running.dataSource, [{ userId: owner.id, role: 'owner' }])
    const stream = connectStream(live.url, owner.cookie)
    await stream.timeout(10_000).emitWithAck('room:join', { roomId })
    const got = new Promise((resolve) => stream.on('pin:deleted', resolve))
    live.realtime.emitToRoom(roomId, 'pin:deleted', { roomId, pinId: 'x1' })
    expect(await got).toEqual({ roomId, pinId: 'x1' })
    stream.close()
  })
})
