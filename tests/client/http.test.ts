import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import * as api from '../../src/api/http'
import { ApiError } from '../../src/api/http'
import { csrfIssuer, fakeServer } from './fake-server'

// Expected behaviour comes from the API contract (DEVELOPERS.md, the server's own
// description): JSON errors { error: { code, message, field? } }, CSRF token in header x-csrf-token on
// every unsafe method, token fetched again after sign-in/sign-out because the session is regenerated.

const editor = { id: 7, email: 'editor@demo.veilroom.test', name: 'Edda Editor' }
const roomJson = {
  id: 'a6f0c0de-1111-4222-8333-944455556666',
  name: 'Courtyard canopy — Example Yard A',
  description: 'Four masts over the courtyard',
  role: 'editor',
  memberCount: 3,
  updatedAt: '2026-11-30T10:00:00.000Z',
  createdAt: '2026-11-01T09:00:00.000Z',
}

beforeEach(() => api.forgetCsrfToken())
afterEach(() => vi.unstubAllGlobals())

describe('CSRF token handling', () => {
  it('sends no token on GET and the fetched token on POST, PATCH and DELETE', async () => {
    const { sent } = fakeServer({
      'GET /api/auth/csrf': csrfIssuer(),
      'GET /api/rooms': () => ({ status: 200, body: { rooms: [] } }),
      'POST /api/rooms': () => ({ status: 201, body: { room: roomJson } }),
      [`PATCH /api/rooms/${roomJson.id}`]: () => ({ status: 200, body: { room: roomJson } }),
      [`DELETE /api/rooms/${roomJson.id}`]: () => ({ status: 204 }),
    })
    await api.listRooms()
    await api.createRoom({ name: 'x', description: '' })
    await api.updateRoom(roomJson.id, { name: 'y' })
    await api.deleteRoom(roomJson.id)
    const tokens = sent.map((r) => `${r.method} ${r.headers['x-csrf-token'] ?? '-'}`)
    // One token fetch serves all three unsafe calls of the same session.
    expect(tokens).toEqual(['GET -', 'GET -', 'POST t1', 'PATCH t1', 'DELETE t1'])
  })

  it('fetches a fresh token after sign-in and after sign-out (session regenerated)', async () => {
    const { sent } = fakeServer({
      'GET /api/auth/csrf': csrfIssuer(),
      'POST /api/auth/signin': () => ({ status: 200, body: { user: editor } }),
      'POST /api/rooms': () => ({ status: 201, body: { room: roomJson } }),
      'POST /api/auth/signout': () => ({ status: 204 }),
    })
    await api.signIn({ email: editor.email, password: 'correct horse battery' })
    await api.createRoom({ name: 'x', description: '' })
    await api.signOut()
    const unsafe = sent.filter((r) => r.method !== 'GET').map((r) => `${r.path} ${r.headers['x-csrf-token']}`)
    expect(unsafe).toEqual(['/api/auth/signin t1', '/api/rooms t2', '/api/auth/signout t2'])
    await api.signIn({ email: editor.email, password: 'correct horse battery' })
    expect(sent.at(-1)?.headers['x-csrf-token']).toBe('t3')
  })

  it('retries once with a new token when the server refuses the old one', async () => {
    let refusals = 0
    const { sent } = fakeServer({
      'GET /api/auth/csrf': csrfIssuer(),
      'POST /api/rooms': (req) =>
        req.headers['x-csrf-token'] === 't1'
          ? (refusals++, { status: 403, body: { error: { code: 'csrf_invalid', message: 'Stale token' } } })
          : { status: 201, body: { room: roomJson } },
    })
    const room = await api.createRoom({ name: 'x', description: '' })
    expect(room.id).toBe(roomJson.id)
    expect(refusals).toBe(1)
    expect(sent.filter((r) => r.path === '/api/rooms').map((r) => r.headers['x-csrf-token'])).toEqual(['t1', 't2'])
  })

  it('does not retry an ordinary 403 (a role refusal is not a stale token)', async () => {
    const { sent } = fakeServer({
      'GET /api/auth/csrf': csrfIssuer(),
      [`DELETE /api/rooms/${roomJson.id}`]: () => ({
        status: 403,
        body: { error: { code: 'forbidden', message: 'Only the owner may delete this room' } },
      }),
    })
    await expect(api.deleteRoom(roomJson.id)).rejects.toMatchObject({ code: 'forbidden', status: 403 })
    expect(sent.filter((r) => r.method === 'DELETE')).toHaveLength(1)
  })
})

describe('ApiError', () => {
  it('carries code, message, field and status from the JSON error shape', async () => {
    fakeServer({
      'GET /api/auth/csrf': csrfIssuer(),
      'POST /api/auth/signup': () => ({
        status: 400,
        body: { error: { code: 'invalid_input', message: 'Must be at least 10 characters', field: 'password' } },
      }),
    })
    const err = await api.signUp({ email: 'a@b.test', name: 'A', password: 'short' }).catch((e: unknown) => e)
    expect(err).toBeInstanceOf(ApiError)
    expect(err).toMatchObject({
      code: 'invalid_input',
      field: 'password',
      status: 400,
      message: 'Must be at least 10 characters',
    })
  })

  it('maps 401 bad_credentials and 429 rate_limited from sign-in', async () => {
    let calls = 0
    fakeServer({
      'GET /api/auth/csrf': csrfIssuer(),
      'POST /api/auth/signin': () =>
        ++calls === 1
          ? { status: 401, body: { error: { code: 'bad_credentials', message: 'Wrong e-mail or password' } } }
          : { status: 429, body: { error: { code: 'rate_limited', message: 'Too many attempts' } } },
    })
    await expect(api.signIn({ email: 'x@y.test', password: 'p' })).rejects.toMatchObject({
      code: 'bad_credentials',
      status: 401,
    })
    await expect(api.signIn({ email: 'x@y.test', password: 'p' })).rejects.toMatchObject({
      code: 'rate_limited',
      status: 429,
    })
  })

  it('names the status when the error body is not the contract shape (e.g. a proxy page)', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => new Response('<html>Bad Gateway</html>', { status: 502, statusText: 'Bad Gateway' })),
    )
    await expect(api.me()).rejects.toMatchObject({
      code: 'http_502',
      status: 502,
      message: 'The server answered 502 Bad Gateway',
    })
  })

  it('reports an unreachable server as code "network" with status 0', async () => {
    fakeServer({ 'GET /api/auth/me': () => 'network-down' })
    await expect(api.me()).rejects.toMatchObject({ code: 'network', status: 0 })
  })

  it('rejects a reply that breaks the contract instead of passing undefined on', async () => {
    fakeServer({ 'GET /api/rooms': () => ({ status: 200, body: { rooms: [{ id: 1, name: 'No role' }] } }) })
    await expect(api.listRooms()).rejects.toMatchObject({ code: 'bad_reply' })
  })
})

describe('replies', () => {
  it('types every id as a string, whether the server sends a UUID or an integer', async () => {
    fakeServer({
      'GET /api/auth/me': () => ({ status: 200, body: { user: editor } }),
      [`GET /api/rooms/${roomJson.id}/members`]: () => ({
        status: 200,
        body: { members: [{ userId: 12, name: 'Olu Owner', email: 'owner@demo.veilroom.test', role: 'owner' }] },
      }),
    })
    expect((await api.me())?.id).toBe('7')
    expect((await api.listMembers(roomJson.id))[0]?.userId).toBe('12')
  })

  it('reads a signed-out session as null', async () => {
    fakeServer({ 'GET /api/auth/me': () => ({ status: 200, body: { user: null } }) })
    expect(await api.me()).toBeNull()
  })

  it('accepts an empty 204 body for sign-out and delete (RFC 9110 §15.3.5: 204 has no content)', async () => {
    fakeServer({ 'GET /api/auth/csrf': csrfIssuer(), 'POST /api/auth/signout': () => ({ status: 204 }) })
    await expect(api.signOut()).resolves.toBeUndefined()
  })

  it('escapes room ids in the path so an id can never reach another route', async () => {
    const { sent } = fakeServer({})
    await api.getRoom('../auth/me').catch(() => undefined)
    expect(sent[0]?.path).toBe('/api/rooms/..%2Fauth%2Fme')
  })
})

describe('a session that ended elsewhere', () => {
  afterEach(() => api.setSignedOutHandler(null))

  it('calls the signed-out handler on 401 signed_out, not on a wrong password', async () => {
    const seen: string[] = []
    api.setSignedOutHandler(() => seen.push('signed out'))
    fakeServer({
      'GET /api/auth/csrf': csrfIssuer(),
      'GET /api/rooms': () => ({ status: 401, body: { error: { code: 'signed_out', message: 'Please sign in.' } } }),
      'POST /api/auth/signin': () => ({ status: 401, body: { error: { code: 'bad_credentials', message: 'Wrong' } } }),
    })
    await expect(api.listRooms()).rejects.toMatchObject({ code: 'signed_out', status: 401 })
    await expect(api.signIn({ email: 'a@b.test', password: 'x' })).rejects.toMatchObject({ code: 'bad_credentials' })
    expect(seen).toEqual(['signed out'])
  })
})
