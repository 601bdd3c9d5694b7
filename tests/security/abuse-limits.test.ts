/**
 * Issue 12, item 10: rate limits on sign-up, invites and room creation, and a per-address limit on
 * failed sign-ins across accounts (password spraying: a few common passwords tried on many
 * accounts, OWASP Authentication Cheat Sheet), besides the per address + e-mail limit that
 * tests/server/auth.test.ts covers. The limits are set small here so the test stays quick; the
 * defaults are in server/config.ts and the README.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient, uniqueEmail } from '../helpers/test-server.js'
import { makeUser, PASSWORD } from '../realtime/live-helpers.js'
import { mailIds, mailTo, startTeamworkServer, type TeamworkServer } from '../server/teamwork-helpers.js'

const LIMIT = 3
let tw: TeamworkServer
beforeAll(async () => {
  tw = await startTeamworkServer(undefined, {
    RATE_SIGNUPS_PER_HOUR: String(LIMIT),
    RATE_ROOMS_PER_HOUR: String(LIMIT),
    RATE_INVITES_PER_HOUR: String(LIMIT),
    RATE_SIGNIN_FAILURES_PER_IP: String(2 * LIMIT),
  })
})
afterAll(async () => {
  await tw?.stop()
})

/** A client signed in as a user inserted directly (sign-ups are the scarce thing here). */
async function member(name: string): Promise<ApiClient> {
  const u = await makeUser(tw.server.dataSource, name)
  const c = tw.client()
  expect((await c.post('/api/auth/signin', { email: u.email, password: PASSWORD })).status).toBe(200)
  return c
}

const expectLimited = (
  reply: { status: number; body: { error?: { code: string; message: string } } },
  what: RegExp,
) => {
  expect(reply.status).toBe(429)
  expect(reply.body.error?.code).toBe('rate_limited')
  expect(reply.body.error?.message).toMatch(what)
}

describe('abuse limits', () => {
  it(`allows ${LIMIT} sign-ups per address per hour, then 429 (refused ones count too)`, async () => {
    const taken = uniqueEmail('first')
    expect(
      (await tw.client().post('/api/auth/signup', { email: taken, name: 'First', password: 'long-enough-pass' }))
        .status,
    ).toBe(201)
    // A probe for an existing address (409) counts: otherwise sign-up would enumerate accounts freely.
    expect(
      (await tw.client().post('/api/auth/signup', { email: taken, name: 'Again', password: 'long-enough-pass' }))
        .status,
    ).toBe(409)
    expect(
      (
        await tw
          .client()
          .post('/api/auth/signup', { email: uniqueEmail('third'), name: 'Third', password: 'long-enough-pass' })
      ).status,
    ).toBe(201)
    const over = await tw
      .client()
      .post('/api/auth/signup', { email: uniqueEmail('fourth'), name: 'Fourth', password: 'long-enough-pass' })
    expectLimited(over, /sign-ups/)
    expect(over.headers.get('ratelimit-policy') ?? over.headers.get('ratelimit')).toBeTruthy()
  })

  it(`allows ${LIMIT} new rooms per user per hour; another user is not held back`, async () => {
    const busy = await member('Builder')
    for (let i = 0; i < LIMIT; i++) expect((await busy.post('/api/rooms', { name: `Bay ${i}` })).status).toBe(201)
    expectLimited(await busy.post('/api/rooms', { name: 'One too many' }), /new rooms/)
    const other = await member('Neighbour')
    expect((await other.post('/api/rooms', { name: 'Next door' })).status).toBe(201)
  })

  it(`allows ${LIMIT} invites per user per hour over all their rooms`, async () => {
    const owner = await member('Inviter')
    const rooms: string[] = []
    for (const name of ['North sail', 'South sail']) rooms.push((await owner.post('/api/rooms', { name })).body.room.id)
    for (let i = 0; i < LIMIT; i++) {
      const to = uniqueEmail('invitee')
      const seen = await mailIds(tw, to)
      expect((await owner.post(`/api/rooms/${rooms[i % 2]}/invites`, { email: to, role: 'viewer' })).status).toBe(201)
      await mailTo(tw, to, seen)
    }
    expectLimited(
      await owner.post(`/api/rooms/${rooms[1]}/invites`, { email: uniqueEmail('late'), role: 'viewer' }),
      /invites/,
    )
  })

  // Last: it leaves this address unable to sign in for the window.
  it(`stops password spraying: ${2 * LIMIT} failed sign-ins from one address over different accounts, then 429 for any`, async () => {
    const victim = await makeUser(tw.server.dataSource, 'Victim')
    for (let i = 0; i < 2 * LIMIT; i++) {
      // One try per account: the per address + e-mail limit (10) never trips.
      const u = await makeUser(tw.server.dataSource, `Sprayed${i}`)
      expect((await tw.client().post('/api/auth/signin', { email: u.email, password: 'Summer2026!' })).status).toBe(401)
    }
    expectLimited(
      await tw.client().post('/api/auth/signin', { email: victim.email, password: 'Summer2026!' }),
      /failed sign-ins from this address/,
    )
    expectLimited(
      await tw.client().post('/api/auth/signin', { email: uniqueEmail('nobody'), password: 'x' }),
      /failed sign-ins/,
    )
  })
})
