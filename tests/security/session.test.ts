/**
 * Session security not already covered by tests/server/auth.test.ts (which checks: a new session
 * id at sign-in, HttpOnly + SameSite=Lax, CSRF refused without a token or with another session's,
 * the sign-in rate limit, bcrypt cost ≥ 10 read from a stored hash). Added here, following the
 * OWASP Session Management Cheat Sheet (recalled from memory): the old session id is dead after
 * sign-out (replaying it is a signed-out request), sign-out ends that user's live sockets, and the
 * CSRF token of the signed-out session does not work in the next one.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import {
  connectDoc,
  connectStream,
  makeRoom,
  makeUser,
  signIn,
  startLive,
  until,
  type Live,
} from '../realtime/live-helpers.js'

let live: Live

beforeAll(async () => {
  live = await startLive()
})
afterAll(async () => {
  await live?.stop()
})

async function csrfFor(cookie: string): Promise<string> {
  const res = await fetch(`${live.url}/api/auth/csrf`, { headers: { cookie } })
  return ((await res.json()) as { token: string }).token
}

async function signOut(cookie: string): Promise<number> {
  const res = await fetch(`${live.url}/api/auth/signout`, {
    method: 'POST',
    headers: { cookie, 'x-csrf-token': await csrfFor(cookie) },
  })
  return res.status
}

const me = async (cookie: string) =>
  ((await (await fetch(`${live.url}/api/auth/me`, { headers: { cookie } })).json()) as { user: unknown }).user

describe('sign-out', () => {
  it('kills the old session id: replaying the cookie is a signed-out request, also for sockets', async () => {
    const u = await makeUser(live.running.dataSource, 'Leaver')
    const roomId = await makeRoom(live.running.dataSource, [{ userId: u.id, role: 'owner' }])
    const cookie = await signIn(live.url, u.email)
    expect(await me(cookie)).not.toBeNull()
    const token = await csrfFor(cookie)
    expect(await signOut(cookie)).toBe(204)
    expect(await me(cookie)).toBeNull()
    const rooms = await fetch(`${live.url}/api/rooms`, { headers: { cookie } })
    expect(rooms.status).toBe(401)
    // The old session's CSRF token is no good either (the session holding it is gone).
    const post = await fetch(`${live.url}/api/rooms`, {
      method: 'POST',
      headers: { cookie, 'x-csrf-token': token, 'content-type': 'application/json' },
      body: JSON.stringify({ name: 'after sign-out' }),
    })
    expect(post.status).toBe(403)
    const doc = connectDoc(live.url, roomId, cookie)
    const refused = await new Promise<number>((resolve) => {
      doc.provider.on('connection-error', () => resolve(401))
      doc.provider.on('status', ({ status }: { status: string }) => status === 'connected' && resolve(101))
    })
    doc.destroy()
    expect(refused).toBe(401)
    const stream = connectStream(live.url, cookie)
    const error = await new Promise<string>((resolve) => {
      stream.once('connect_error', (err) => resolve(err.message))
      stream.once('connect', () => resolve('connected'))
    })
    stream.close()
    expect(error).toBe('signed_out')
  })

  it("closes the signed-out user's open sync and surface-stream sockets", async () => {
    const u = await makeUser(live.running.dataSource, 'Closer')
    const roomId = await makeRoom(live.running.dataSource, [{ userId: u.id, role: 'owner' }])
    const cookie = await signIn(live.url, u.email)
    const doc = connectDoc(live.url, roomId, cookie)
    await doc.synced
    const stream = connectStream(live.url, cookie)
    const ack = (await stream.timeout(10_000).emitWithAck('room:join', { roomId })) as { ok: boolean }
    expect(ack.ok).toBe(true)
    let syncClosed = false
    let streamClosed = false
    doc.provider.on('connection-close', () => (syncClosed = true))
    stream.on('disconnect', () => (streamClosed = true))
    try {
      expect(await signOut(cookie)).toBe(204)
      await until(() => syncClosed && streamClosed, 5000, 'both sockets closed after sign-out')
    } finally {
      doc.destroy()
      stream.close()
    }
  })
})
