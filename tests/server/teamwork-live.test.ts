import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Socket } from 'socket.io-client'
import { parseFrameJson } from '../../shared/frame/index.js'
import { connectStream, makeRoom, makeUser, signIn, startLive, until, type Live } from '../realtime/live-helpers.js'

// The team-work routes against the real live room (server/realtime): sockets, the room document
// and the solver pool, not a stand-in.
let live: Live
let roomId: string
const cookies: Record<'owner' | 'editor' | 'reviewer' | 'viewer', string> = {
  owner: '',
  editor: '',
  reviewer: '',
  viewer: '',
}
const sockets: Socket[] = []

async function call(who: keyof typeof cookies, method: string, path: string, body?: unknown) {
  const cookie = cookies[who]
  const headers: Record<string, string> = { cookie }
  if (method !== 'GET') {
    headers['x-csrf-token'] = (
      (await (await fetch(`${live.url}/api/auth/csrf`, { headers: { cookie } })).json()) as { token: string }
    ).token
  }
  if (body !== undefined) headers['content-type'] = 'application/json'
  const res = await fetch(live.url + path, {
    method,
    headers,
    body: body === undefined ? undefined : JSON.stringify(body),
  })
  const text = await res.text()
  return {
    status: res.status,
    text,
    body: res.headers.get('content-type')?.includes('json') && text ? JSON.parse(text) : null,
  }
}

function joined(who: keyof typeof cookies): Promise<Socket> {
  const socket = connectStream(live.url, cookies[who])
  sockets.push(socket)
  return new Promise((resolve, reject) => {
    socket.emit('room:join', { roomId }, (ack: { ok: boolean }) =>
      ack.ok ? resolve(socket) : reject(new Error(JSON.stringify(ack))),
    )
  })
}

beforeAll(async () => {
  live = await startLive()
  const ds = live.running.dataSource
  const users = {
    owner: await makeUser(ds, 'Owner'),
    editor: await makeUser(ds, 'Editor'),
    reviewer: await makeUser(ds, 'Reviewer'),
    viewer: await makeUser(ds, 'Viewer'),
  }
  roomId = await makeRoom(
    ds,
    (Object.keys(users) as (keyof typeof users)[]).map((role) => ({ userId: users[role].id, role })),
  )
  for (const role of Object.keys(users) as (keyof typeof users)[])
    cookies[role] = await signIn(live.url, users[role].email)
  // A flat 6 m × 6 m square held on rigid edges: its minimal surface is the plane itself.
  await live.realtime.ensureRoomFrame(roomId, 'blank')
}, 60_000)
afterAll(async () => {
  for (const s of sockets) s.close()
  await live?.stop()
})

describe('team work in a live room', () => {
  it('broadcasts pin:changed and pin:deleted over the room socket', async () => {
    const viewer = await joined('viewer')
    const events: { event: string; payload: any }[] = []
    viewer.on('pin:changed', (payload) => events.push({ event: 'pin:changed', payload }))
    viewer.on('pin:deleted', (payload) => events.push({ event: 'pin:deleted', payload }))
    const created = await call('reviewer', 'POST', `/api/rooms/${roomId}/pins`, {
      x: 3,
      y: 3,
      z: 0,
      docVersion: 1,
      body: 'Flat: will pond',
    })
    expect(created.status).toBe(201)
    await until(() => events.length === 1, 5000, 'pin:changed')
    expect(events[0]).toEqual({ event: 'pin:changed', payload: { roomId, pin: created.body.pin } })
    expect((await call('reviewer', 'DELETE', `/api/rooms/${roomId}/pins/${created.body.pin.id}`)).status).toBe(204)
    await until(() => events.length === 2, 5000, 'pin:deleted')
    expect(events[1]).toEqual({ event: 'pin:deleted', payload: { roomId, pinId: created.body.pin.id } })
  })

  it('saves a snapshot of the settled surface: a flat square keeps area = plan area = 36 m²', async () => {
    const saved = await call('editor', 'POST', `/api/rooms/${roomId}/snapshots`, { name: 'flat start' })
    expect(saved.status).toBe(201)
    // Plane area = |n|·plan area with n vertical (elementary geometry): 6 × 6 m, all heights 0.
    expect(saved.body.snapshot.figures.area).toBeCloseTo(36, 6)
    expect(saved.body.snapshot.figures.planArea).toBeCloseTo(36, 6)
    expect(saved.body.snapshot.figures.heightRange).toEqual([0, 0])
    const { frame } = await live.realtime.getRoomFrame(roomId)
    const download = await call('viewer', 'GET', `/api/rooms/${roomId}/snapshots/${saved.body.snapshot.id}/frame.json`)
    expect(parseFrameJson(download.text)).toEqual(frame)
    const surface = await call('viewer', 'GET', `/api/rooms/${roomId}/snapshots/${saved.body.snapshot.id}/surface`)
    const settled = (await live.realtime.getLatestSurface(roomId))!
    expect(surface.body.vertices).toHaveLength(settled.vertices.length / 3)
    expect(surface.body.solver).toEqual(settled.solver)
  }, 90_000)

  it('closes a removed member’s room socket', async () => {
    const viewer = await joined('viewer')
    let gone = false
    viewer.on('disconnect', () => (gone = true))
    const [row] = await live.running.dataSource.query(
      'SELECT user_id FROM memberships WHERE room_id = ? AND role = ?',
      [roomId, 'viewer'],
    )
    expect((await call('owner', 'DELETE', `/api/rooms/${roomId}/members/${row.user_id}`)).status).toBe(204)
    await until(() => gone, 5000, 'the viewer socket to close')
  })
})
