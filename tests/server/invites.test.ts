import { createHash } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { invitesService } from '../../server/modules/invites/invites-service.js'
import { uniqueEmail } from '../helpers/test-server.js'
import {
  mailedInvite,
  roomWithCast,
  startTeamworkServer,
  type RoomCast,
  type TeamworkServer,
} from './teamwork-helpers.js'

let tw: TeamworkServer
let cast: RoomCast
beforeAll(async () => {
  tw = await startTeamworkServer()
  cast = await roomWithCast(tw, 'Four-point sail — invite test')
})
afterAll(async () => {
  await tw?.stop()
})

const invite = (email: string, role = 'reviewer') => mailedInvite(tw, cast, email, role)

describe('invite flow through the fake SMTP server', () => {
  it('mails a single-use link that a newly signed-up user accepts', async () => {
    const email = uniqueEmail('guest')
    const { reply, mail, token } = await invite(email, 'editor')
    expect(reply.body.invite).toEqual({ id: expect.any(String), email, role: 'editor', expiresAt: expect.any(String) })
    const days = (Date.parse(reply.body.invite.expiresAt) - Date.now()) / 86_400_000
    expect(days).toBeGreaterThan(6.99)
    expect(days).toBeLessThanOrEqual(7)

    // The link is built from PUBLIC_URL; the token is 32 random bytes in base64url (43 characters).
    expect(mail.text).toContain(`${tw.server.config.PUBLIC_URL.replace(/\/$/, '')}/invite/${token}`)
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/)
    expect(mail.subject).toContain('Four-point sail — invite test')
    // Only the SHA-256 of the token is stored (FIPS 180-4 hash via node:crypto).
    const [row] = await tw.server.dataSource.query('SELECT token_hash FROM invites WHERE id = ?', [
      reply.body.invite.id,
    ])
    expect(row.token_hash).toBe(createHash('sha256').update(token).digest('hex'))
    expect(JSON.stringify(row)).not.toContain(token)

    const preview = await tw.client().get(`/api/invites/${token}`)
    expect(preview.status).toBe(200)
    expect(preview.body.invite).toMatchObject({
      roomName: 'Four-point sail — invite test',
      role: 'editor',
      email,
      invitedBy: 'Olga Owner',
    })

    const guest = tw.client()
    expect((await guest.post(`/api/invites/${token}/accept`)).status).toBe(401)
    // The account must carry the invited address (in any case: addresses compare case-insensitively).
    expect(
      (
        await guest.post('/api/auth/signup', {
          email: email.toUpperCase(),
          name: 'Gita Guest',
          password: 'guest-password-1',
        })
      ).status,
    ).toBe(201)
    const accepted = await guest.post(`/api/invites/${token}/accept`)
    expect(accepted.status).toBe(200)
    expect(accepted.body).toEqual({ roomId: cast.roomId, role: 'editor' })
    expect((await guest.get(`/api/rooms/${cast.roomId}`)).body.room.role).toBe('editor')

    const again = await tw.client().get(`/api/invites/${token}`)
    expect(again.status).toBe(410)
    expect(again.body.error.code).toBe('invite_used')
    const reuse = tw.client()
    await reuse.signUpFresh('late')
    const second = await reuse.post(`/api/invites/${token}/accept`)
    expect(second.status).toBe(410)
    expect(second.body.error).toMatchObject({
      code: 'invite_used',
      message: expect.stringMatching(/already been used/),
    })
  })

  it('refuses an expired invite with 410 invite_expired', async () => {
    const { reply, token } = await invite(uniqueEmail('late'))
    await tw.server.dataSource.query('UPDATE invites SET expires_at = ? WHERE id = ?', [
      new Date(Date.now() - 60_000),
      reply.body.invite.id,
    ])
    const preview = await tw.client().get(`/api/invites/${token}`)
    expect(preview.status).toBe(410)
    expect(preview.body.error.code).toBe('invite_expired')
    const c = tw.client()
    await c.signUpFresh('late-user')
    expect((await c.post(`/api/invites/${token}/accept`)).body.error.code).toBe('invite_expired')
    const pending = await cast.clients.owner.get(`/api/rooms/${cast.roomId}/invites`)
    expect(pending.body.invites.map((i: { id: string }) => i.id)).not.toContain(reply.body.invite.id)
  })

  it('lists pending invites and revokes one (410 invite_revoked afterwards)', async () => {
    const email = uniqueEmail('revoked')
    const { reply, token } = await invite(email, 'viewer')
    const pending = await cast.clients.owner.get(`/api/rooms/${cast.roomId}/invites`)
    expect(pending.body.invites).toContainEqual(
      expect.objectContaining({
        id: reply.body.invite.id,
        email,
        role: 'viewer',
        invitedBy: { id: cast.ids.owner, name: 'Olga Owner' },
      }),
    )
    expect((await cast.clients.owner.delete(`/api/rooms/${cast.roomId}/invites/${reply.body.invite.id}`)).status).toBe(
      204,
    )
    const preview = await tw.client().get(`/api/invites/${token}`)
    expect(preview.status).toBe(410)
    expect(preview.body.error.code).toBe('invite_revoked')
    const after = await cast.clients.owner.get(`/api/rooms/${cast.roomId}/invites`)
    expect(after.body.invites.map((i: { id: string }) => i.id)).not.toContain(reply.body.invite.id)
  })

  it('keeps the higher role when a member accepts a weaker invite', async () => {
    const email = uniqueEmail('twice')
    const weak = await invite(email, 'viewer')
    const strong = await invite(email, 'editor')
    const c = tw.client()
    await c.post('/api/auth/signup', { email, name: 'Twice Invited', password: 'long-enough-pass' })
    expect((await c.post(`/api/invites/${strong.token}/accept`)).body.role).toBe('editor')
    expect((await c.post(`/api/invites/${weak.token}/accept`)).body).toEqual({ roomId: cast.roomId, role: 'editor' })
  })

  it('answers 404 invite_not_found for unknown or malformed tokens', async () => {
    for (const token of ['A'.repeat(43), 'short', 'x'.repeat(200)]) {
      const reply = await tw.client().get(`/api/invites/${token}`)
      expect(reply.status).toBe(404)
      expect(reply.body.error.code).toBe('invite_not_found')
    }
  })

  it('validates the invite body, naming the field', async () => {
    const bad = await cast.clients.owner.post(`/api/rooms/${cast.roomId}/invites`, {
      email: 'not-an-address',
      role: 'editor',
    })
    expect(bad.status).toBe(400)
    expect(bad.body.error.field).toBe('email')
    const role = await cast.clients.owner.post(`/api/rooms/${cast.roomId}/invites`, {
      email: uniqueEmail(),
      role: 'admin',
    })
    expect(role.body.error.field).toBe('role')
  })

  it('refuses to invite someone who is already a member (409, field email)', async () => {
    const [row] = await tw.server.dataSource.query('SELECT email FROM users WHERE id = ?', [cast.ids.viewer])
    const reply = await cast.clients.owner.post(`/api/rooms/${cast.roomId}/invites`, {
      email: row.email,
      role: 'editor',
    })
    expect(reply.status).toBe(409)
    expect(reply.body.error).toMatchObject({ code: 'already_member', field: 'email' })
  })

  it('keeps nothing when the mail cannot be sent (502 mail_failed)', async () => {
    const failing = { send: () => Promise.reject(new Error('connection refused')), close: () => {} }
    const service = invitesService({
      dataSource: tw.server.dataSource,
      mailer: failing,
      publicUrl: 'http://example.test',
    })
    const email = uniqueEmail('unmailed')
    await expect(
      service.create(cast.roomId, { email, role: 'viewer' }, { id: cast.ids.owner, name: 'Olga Owner' }),
    ).rejects.toMatchObject({ code: 'mail_failed', status: 502 })
    const rows = await tw.server.dataSource.query('SELECT id FROM invites WHERE email = ?', [email])
    expect(rows).toEqual([])
  })
})
