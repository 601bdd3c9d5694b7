import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { forgetCsrfToken } from '../../src/api/http'
import { useRoomsStore } from '../../src/stores/rooms'
import { useSessionStore } from '../../src/stores/session'
import { csrfIssuer, fakeServer } from './fake-server'

// Behaviour follows the API contract of issue 2 (DEVELOPERS.md): sign-in returns { user },
// sign-out 204, rooms list/create/patch/delete with the shapes below.

const editor = { id: 'u-2', email: 'editor@demo.veilroom.test', name: 'Edda Editor' }
const room = (id: string, name: string, role = 'owner') => ({
  id,
  name,
  description: '',
  role,
  memberCount: 1,
  updatedAt: '2026-11-30T10:00:00.000Z',
  createdAt: '2026-11-30T10:00:00.000Z',
})

beforeEach(() => {
  setActivePinia(createPinia())
  forgetCsrfToken()
})
afterEach(() => vi.unstubAllGlobals())

describe('useSessionStore', () => {
  it('loads the user once and shares one request between concurrent callers', async () => {
    const { sent } = fakeServer({ 'GET /api/auth/me': () => ({ status: 200, body: { user: editor } }) })
    const session = useSessionStore()
    await Promise.all([session.load(), session.load()])
    await session.load()
    expect(sent).toHaveLength(1)
    expect(session.signedIn).toBe(true)
    expect(session.user?.name).toBe('Edda Editor')
    await session.load(true)
    expect(sent).toHaveLength(2)
  })

  it('signs in with a trimmed e-mail and keeps the user; a failure leaves it signed out', async () => {
    const { sent } = fakeServer({
      'GET /api/auth/csrf': csrfIssuer(),
      'POST /api/auth/signin': (req) =>
        (req.body as { password: string }).password === 'right-password'
          ? { status: 200, body: { user: editor } }
          : { status: 401, body: { error: { code: 'bad_credentials', message: 'Wrong e-mail or password' } } },
    })
    const session = useSessionStore()
    await expect(session.signIn(' editor@demo.veilroom.test ', 'wrong')).rejects.toMatchObject({
      code: 'bad_credentials',
    })
    expect(session.signedIn).toBe(false)
    await session.signIn('editor@demo.veilroom.test', 'right-password')
    expect(session.user?.email).toBe(editor.email)
    expect(sent.find((r) => r.method === 'POST')?.body).toEqual({ email: editor.email, password: 'wrong' })
  })

  it('signs up and is signed in straight away', async () => {
    fakeServer({
      'GET /api/auth/csrf': csrfIssuer(),
      'POST /api/auth/signup': () => ({ status: 201, body: { user: editor } }),
    })
    const session = useSessionStore()
    await session.signUp('editor@demo.veilroom.test', '  Edda Editor ', 'long enough password')
    expect(session.signedIn).toBe(true)
  })

  it('forgets the user on sign-out even when the server call fails', async () => {
    fakeServer({ 'GET /api/auth/csrf': csrfIssuer(), 'POST /api/auth/signout': () => 'network-down' })
    const session = useSessionStore()
    session.user = editor
    await expect(session.signOut()).rejects.toMatchObject({ code: 'network' })
    expect(session.user).toBeNull()
  })
})

describe('useRoomsStore', () => {
  it('lists, creates (on top), renames and removes rooms, keeping the list in step with the server', async () => {
    let created = 0
    fakeServer({
      'GET /api/auth/csrf': csrfIssuer(),
      'GET /api/rooms': () => ({ status: 200, body: { rooms: [room('r1', 'Terrace sail')] } }),
      'POST /api/rooms': (req) => ({
        status: 201,
        body: { room: room(`n${++created}`, (req.body as { name: string }).name) },
      }),
      'PATCH /api/rooms/r1': (req) => ({
        status: 200,
        body: { room: room('r1', (req.body as { name: string }).name) },
      }),
      'DELETE /api/rooms/r1': () => ({ status: 204 }),
    })
    const rooms = useRoomsStore()
    await rooms.list()
    expect(rooms.rooms.map((r) => r.name)).toEqual(['Terrace sail'])
    await rooms.create('  Hypar over the bike shed ', '')
    expect(rooms.rooms.map((r) => r.id)).toEqual(['n1', 'r1'])
    expect(rooms.rooms[0]?.name).toBe('Hypar over the bike shed')
    await rooms.rename('r1', 'Terrace sail, four points')
    expect(rooms.rooms.find((r) => r.id === 'r1')?.name).toBe('Terrace sail, four points')
    expect(rooms.rooms[1]).not.toHaveProperty('createdAt')
    await rooms.remove('r1')
    expect(rooms.rooms.map((r) => r.id)).toEqual(['n1'])
  })

  it('keeps the list unchanged when the server refuses a delete', async () => {
    fakeServer({
      'GET /api/auth/csrf': csrfIssuer(),
      'GET /api/rooms': () => ({ status: 200, body: { rooms: [room('r1', 'Terrace sail', 'editor')] } }),
      'DELETE /api/rooms/r1': () => ({ status: 403, body: { error: { code: 'forbidden', message: 'Owners only' } } }),
    })
    const rooms = useRoomsStore()
    await rooms.list()
    await expect(rooms.remove('r1')).rejects.toMatchObject({ status: 403 })
    expect(rooms.rooms).toHaveLength(1)
    expect(rooms.loading).toBe(false)
  })
})
