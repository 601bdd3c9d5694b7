/**
 * Issue 12, items 2 and 3: the dev mailbox and invite acceptance, as an attacker with an account
 * would try them. The rule is our own (server/mail/README.md, server/modules/invites/README.md):
 * an invite link is a key to a room, so its mail shows only to its addressee, and only the account
 * with the invited address (compared case-insensitively, as e-mail local parts are in practice;
 * RFC 5321 §2.4 leaves them case-sensitive, we do not) can use it.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, uniqueEmail } from '../helpers/test-server.js'
import {
  inviteTokenIn,
  mailedInvite,
  roomWithCast,
  startTeamworkServer,
  type RoomCast,
  type TeamworkServer,
} from '../server/teamwork-helpers.js'

let tw: TeamworkServer
let cast: RoomCast
beforeAll(async () => {
  tw = await startTeamworkServer()
  cast = await roomWithCast(tw, 'Harbour walk canopy — invite binding')
})
afterAll(async () => {
  await tw?.stop()
})

/** The owner invites `email`; returns the token from the mail the fake SMTP server caught. */
const invite = async (email: string, role: string) => (await mailedInvite(tw, cast, email, role)).token

async function signUpAs(email: string): Promise<ApiClient> {
  const c = tw.client()
  const reply = await c.post('/api/auth/signup', { email, name: 'Addressee', password: 'addressee-password' })
  expect(reply.status).toBe(201)
  return c
}

describe('dev mailbox (item 2)', () => {
  it('needs a signed-in user and lists only mail addressed to that user', async () => {
    const guest = uniqueEmail('mailbox-guest')
    const token = await invite(guest, 'reviewer')

    const signedOut = await tw.client().get('/api/dev/mailbox')
    expect(signedOut.status).toBe(401)
    expect(signedOut.body.error.code).toBe('signed_out')

    // The owner sent it, an outsider is nosy: neither sees it, with or without the old ?to= filter.
    for (const c of [cast.clients.owner, cast.clients.outsider]) {
      for (const path of [
        '/api/dev/mailbox',
        `/api/dev/mailbox?to=${encodeURIComponent(guest)}`,
        '/api/dev/mailbox?limit=500',
      ]) {
        const reply = await c.get(path)
        expect(reply.status).toBe(200)
        expect(JSON.stringify(reply.body)).not.toContain(token)
        expect(reply.body.messages.every((m: { to: string }) => !m.to.includes(guest))).toBe(true)
      }
    }

    const addressee = await signUpAs(guest)
    const mine = await addressee.get('/api/dev/mailbox')
    expect(mine.status).toBe(200)
    expect(mine.body.messages.length).toBeGreaterThan(0)
    expect(mine.body.messages.every((m: { to: string }) => m.to.toLowerCase().split(', ').includes(guest))).toBe(true)
    expect(mine.body.messages.some((m: { text: string }) => inviteTokenIn(m.text) === token)).toBe(true)
  })

  it('matches the address literally: _ is no LIKE wildcard', async () => {
    // "_" is valid in an address and is SQL LIKE's any-one-character: as many of them as the
    // target's local part has would match the target's mail if the address were not escaped.
    const target = uniqueEmail('wild')
    await invite(target, 'viewer')
    const [local, domain] = target.split('@') as [string, string]
    const wild = await signUpAs(`${'_'.repeat(local.length)}@${domain}`)
    const reply = await wild.get('/api/dev/mailbox')
    expect(reply.status).toBe(200)
    expect(reply.body.messages).toEqual([])
  })
})

describe('invite acceptance bound to the invited address (item 3)', () => {
  it('refuses an existing viewer accepting an owner invite sent to someone else, and the invite stays usable', async () => {
    const invited = uniqueEmail('owner-to-be')
    const token = await invite(invited, 'owner')

    const stolen = await cast.clients.viewer.post(`/api/invites/${token}/accept`)
    expect(stolen.status).toBe(403)
    expect(stolen.body.error.code).toBe('invite_other_address')
    expect(stolen.body.error.message).toContain(invited)
    expect((await cast.clients.viewer.get(`/api/rooms/${cast.roomId}`)).body.room.role).toBe('viewer')

    const stranger = tw.client()
    await stranger.signUpFresh('stranger')
    expect((await stranger.post(`/api/invites/${token}/accept`)).status).toBe(403)
    expect((await stranger.get(`/api/rooms/${cast.roomId}`)).status).toBe(404)

    // Still usable: the preview answers, and the invited person joins with the role offered.
    expect((await tw.client().get(`/api/invites/${token}`)).status).toBe(200)
    const rightful = await signUpAs(invited)
    const accepted = await rightful.post(`/api/invites/${token}/accept`)
    expect(accepted.status).toBe(200)
    expect(accepted.body).toEqual({ roomId: cast.roomId, role: 'owner' })
  })

  it('compares the addresses case-insensitively', async () => {
    const invited = uniqueEmail('MiXeD-Case')
    const token = await invite(invited.toUpperCase(), 'editor')
    const person = await signUpAs(invited.replace(/^m/, 'M'))
    const accepted = await person.post(`/api/invites/${token}/accept`)
    expect(accepted.status).toBe(200)
    expect(accepted.body.role).toBe('editor')
  })
})
