import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MembershipEntity, type RoomRole } from '../../server/db/entities/index.js'
import type { Running } from '../../server/main.js'
import { ApiClient, startTestServer } from '../helpers/test-server.js'

// Expected statuses follow the task's access rules: not a member → 404, role too low → 403,
// signed out → 401; owner ⊃ editor ⊃ reviewer ⊃ viewer (product brief, "Words").
type Who = RoomRole | 'outsider' | 'signedOut'
const everyone: Who[] = ['owner', 'editor', 'reviewer', 'viewer', 'outsider', 'signedOut']

let server: Running
const clients = {} as Record<Who, ApiClient>
const userIds = {} as Record<Who, string>

/** Creates a room owned by `owner` with the editor, reviewer and viewer added as members. */
async function roomWithMembers(name = 'Canopy ' + randomUUID().slice(0, 6)): Promise<string> {
  const created = await clients.owner.post('/api/rooms', { name, description: 'Test room' })
  expect(created.status).toBe(201)
  const roomId = created.body.room.id as string
  const repo = server.dataSource.getRepository(MembershipEntity)
  for (const role of ['editor', 'reviewer', 'viewer'] as const) {
    await repo.insert({ id: randomUUID(), roomId, userId: userIds[role], role })
  }
  return roomId
}

beforeAll(async () => {
  server = await startTestServer()
  for (const who of everyone) {
    clients[who] = new ApiClient(server.url)
    if (who !== 'signedOut') userIds[who] = (await clients[who].signUpFresh(who, `Member ${who}`)).id
  }
})
afterAll(async () => {
  await server?.stop()
})

describe('room routes × role', () => {
  let roomId: string
  beforeAll(async () => {
    roomId = await roomWithMembers()
  })

  const readable: Record<Who, number> = {
    owner: 200,
    editor: 200,
    reviewer: 200,
    viewer: 200,
    outsider: 404,
    signedOut: 401,
  }
  const editable: Record<Who, number> = {
    owner: 200,
    editor: 200,
    reviewer: 403,
    viewer: 403,
    outsider: 404,
    signedOut: 401,
  }

  it.each(everyone)('GET /api/rooms/:id as %s', async (who) => {
    const reply = await clients[who].get(`/api/rooms/${roomId}`)
    expect(reply.status).toBe(readable[who])
    if (reply.status === 200) {
      expect(reply.body.room).toMatchObject({ id: roomId, role: who, memberCount: 4, description: 'Test room' })
      expect(Date.parse(reply.body.room.createdAt)).not.toBeNaN()
      expect(Date.parse(reply.body.room.updatedAt)).not.toBeNaN()
    } else {
      expect(reply.body.error.code).toBe({ 404: 'room_not_found', 401: 'signed_out' }[reply.status as 404 | 401])
    }
  })

  it.each(everyone)('GET /api/rooms/:id/members as %s', async (who) => {
    const reply = await clients[who].get(`/api/rooms/${roomId}/members`)
    expect(reply.status).toBe(readable[who])
    if (reply.status === 200) {
      expect(reply.body.members.map((m: { role: string }) => m.role)).toEqual(['owner', 'editor', 'reviewer', 'viewer'])
      expect(reply.body.members[0]).toEqual({
        userId: userIds.owner,
        name: 'Member owner',
        email: expect.stringContaining('@'),
        role: 'owner',
      })
    }
  })

  it.each(everyone)('PATCH /api/rooms/:id as %s', async (who) => {
    const reply = await clients[who].patch(`/api/rooms/${roomId}`, { description: `edited by ${who}` })
    expect(reply.status).toBe(editable[who])
    if (reply.status === 200)
      expect(reply.body.room).toMatchObject({ id: roomId, description: `edited by ${who}`, role: who })
    if (reply.status === 403) expect(reply.body.error.code).toBe('forbidden')
  })

  it.each(everyone)('DELETE /api/rooms/:id as %s', async (who) => {
    const target = await roomWithMembers()
    const reply = await clients[who].delete(`/api/rooms/${target}`)
    expect(reply.status).toBe(
      { owner: 204, editor: 403, reviewer: 403, viewer: 403, outsider: 404, signedOut: 401 }[who],
    )
    const after = await clients.owner.get(`/api/rooms/${target}`)
    expect(after.status).toBe(who === 'owner' ? 404 : 200)
  })

  it.each(everyone)('GET /api/rooms as %s lists exactly the rooms one belongs to', async (who) => {
    const reply = await clients[who].get('/api/rooms')
    if (who === 'signedOut') return expect(reply.status).toBe(401)
    expect(reply.status).toBe(200)
    const mine = reply.body.rooms.find((r: { id: string }) => r.id === roomId)
    if (who === 'outsider') expect(mine).toBeUndefined()
    else expect(mine).toMatchObject({ name: expect.any(String), role: who, memberCount: 4 })
  })

  it.each(everyone)('POST /api/rooms as %s', async (who) => {
    const reply = await clients[who].post('/api/rooms', { name: `Made by ${who}`, description: '' })
    expect(reply.status).toBe(who === 'signedOut' ? 401 : 201)
    if (reply.status === 201)
      expect(reply.body.room).toMatchObject({ name: `Made by ${who}`, role: 'owner', memberCount: 1 })
  })
})

describe('room input', () => {
  it('names the field and the reason for bad input', async () => {
    const empty = await clients.owner.post('/api/rooms', { name: '   ' })
    expect(empty.status).toBe(400)
    expect(empty.body.error).toMatchObject({ code: 'invalid_input', field: 'name' })
    const long = await clients.owner.post('/api/rooms', { name: 'n'.repeat(121) })
    expect(long.body.error).toMatchObject({ field: 'name', message: expect.stringContaining('120') })
    const longText = await clients.owner.post('/api/rooms', { name: 'ok', description: 'd'.repeat(2001) })
    expect(longText.body.error).toMatchObject({ field: 'description', message: expect.stringContaining('2000') })
    const nothing = await clients.owner.patch(`/api/rooms/${await roomWithMembers()}`, {})
    expect(nothing.status).toBe(400)
  })

  // Starting frames: shared/room-doc/starters.ts (our own geometry); the tent is a square with a mast
  // ring (a hole loop), the blank a 6 m square with none.
  it('creates a room from a starting frame: the tent has a hole loop, the default is the blank square', async () => {
    const tent = await clients.owner.post('/api/rooms', { name: 'Tent start', starter: 'tent' })
    expect(tent.status).toBe(201)
    const tentFrame = await clients.owner.get(`/api/rooms/${tent.body.room.id}/frame.json`)
    expect(tentFrame.status).toBe(200)
    const roles = (tentFrame.body.loops as { role: string; points: unknown[] }[]).map((l) => l.role)
    expect(roles).toEqual(['outer', 'hole'])
    expect(tentFrame.body.loops[1].points).toHaveLength(12)
    const plain = await clients.owner.post('/api/rooms', { name: 'Plain start' })
    const plainFrame = await clients.owner.get(`/api/rooms/${plain.body.room.id}/frame.json`)
    expect((plainFrame.body.loops as { role: string }[]).map((l) => l.role)).toEqual(['outer'])
  })

  it('refuses an unknown starting frame, naming the field', async () => {
    const reply = await clients.owner.post('/api/rooms', { name: 'Odd start', starter: 'dome' })
    expect(reply.status).toBe(400)
    expect(reply.body.error).toMatchObject({
      code: 'invalid_input',
      field: 'starter',
      message: expect.stringContaining('tent'),
    })
  })

  it('accepts the limits exactly: 120-character name, 2000-character description', async () => {
    const reply = await clients.owner.post('/api/rooms', { name: 'n'.repeat(120), description: 'd'.repeat(2000) })
    expect(reply.status).toBe(201)
  })

  it('answers 404 for ids that are not room ids and for rooms that do not exist', async () => {
    expect((await clients.owner.get('/api/rooms/not-a-uuid')).status).toBe(404)
    expect((await clients.owner.get(`/api/rooms/${randomUUID()}`)).status).toBe(404)
    expect((await clients.owner.get("/api/rooms/1' OR '1'='1")).status).toBe(404)
  })

  it('deleting a room removes its memberships (cascade)', async () => {
    const roomId = await roomWithMembers()
    expect((await clients.owner.delete(`/api/rooms/${roomId}`)).status).toBe(204)
    expect(await server.dataSource.getRepository(MembershipEntity).countBy({ roomId })).toBe(0)
  })
})
