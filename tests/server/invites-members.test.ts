import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { roomWithCast, startTeamworkServer, type TeamworkServer } from './teamwork-helpers.js'

let tw: TeamworkServer
beforeAll(async () => {
  tw = await startTeamworkServer()
})
afterAll(async () => {
  await tw?.stop()
})

describe('member roles and the last-owner rule', () => {
  it('never lets the last owner be demoted or removed (409 last_owner)', async () => {
    const { roomId, clients, ids } = await roomWithCast(tw)
    const demote = await clients.owner.patch(`/api/rooms/${roomId}/members/${ids.owner}`, { role: 'editor' })
    expect(demote.status).toBe(409)
    expect(demote.body.error).toMatchObject({
      code: 'last_owner',
      message: expect.stringMatching(/at least one owner/),
    })
    expect((await clients.owner.delete(`/api/rooms/${roomId}/members/${ids.owner}`)).body.error.code).toBe('last_owner')

    // With a second owner, the first may step down; then they lose owner rights.
    expect(
      (await clients.owner.patch(`/api/rooms/${roomId}/members/${ids.editor}`, { role: 'owner' })).body.member,
    ).toEqual({ userId: ids.editor, role: 'owner' })
    expect((await clients.owner.patch(`/api/rooms/${roomId}/members/${ids.owner}`, { role: 'editor' })).status).toBe(
      200,
    )
    expect((await clients.owner.patch(`/api/rooms/${roomId}/members/${ids.viewer}`, { role: 'editor' })).status).toBe(
      403,
    )
    expect((await clients.editor.delete(`/api/rooms/${roomId}/members/${ids.editor}`)).body.error.code).toBe(
      'last_owner',
    )
  })

  it('lets a member leave, closes their sockets, and stops others removing people', async () => {
    const { roomId, clients, ids } = await roomWithCast(tw)
    expect((await clients.reviewer.delete(`/api/rooms/${roomId}/members/${ids.viewer}`)).status).toBe(403)
    expect((await clients.viewer.delete(`/api/rooms/${roomId}/members/${ids.viewer}`)).status).toBe(204)
    expect(tw.live.closed).toContainEqual({ roomId, userId: ids.viewer })
    expect((await clients.viewer.get(`/api/rooms/${roomId}`)).status).toBe(404)
    expect((await clients.owner.delete(`/api/rooms/${roomId}/members/${ids.reviewer}`)).status).toBe(204)
    expect(tw.live.closed).toContainEqual({ roomId, userId: ids.reviewer })
  })

  it('answers 404 member_not_found for a user outside the room and 400 for a bad role', async () => {
    const { roomId, clients, ids } = await roomWithCast(tw)
    const outside = await clients.owner.patch(`/api/rooms/${roomId}/members/${ids.outsider}`, { role: 'viewer' })
    expect(outside.status).toBe(404)
    expect(outside.body.error.code).toBe('member_not_found')
    const bad = await clients.owner.patch(`/api/rooms/${roomId}/members/${ids.editor}`, { role: 'boss' })
    expect(bad.status).toBe(400)
    expect(bad.body.error.field).toBe('role')
  })
})
