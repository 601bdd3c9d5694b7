/**
 * The one authorisation matrix: every HTTP route (read from the Express router stack at run time,
 * so a new route without a row here fails), every socket.io event a client may send, and every
 * y-websocket message type, against every kind of caller. The rule is the product's role table
 * (PRODUCT.md "Words": owner ⊃ editor ⊃ reviewer ⊃ viewer) and the live-room protocol
 * (server/realtime/README.md: reviewers and viewers read only). Room routes answer signed out → 401,
 * not a member → 404 room_not_found (rooms are not probeable), role too low → 403 forbidden.
 *
 * "Allowed" means the request got past the guard: the route's own answer (often 400 for the empty
 * body we send, or 404 for a made-up pin id). What each route does when allowed is tested by its
 * module's tests (tests/server/*); here only who gets through is checked.
 */
import { randomUUID } from 'node:crypto'
import type { Express } from 'express'
import { Socket as ServerSocket } from 'socket.io'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { RoomRole } from '../../server/db/entities/index.js'
import * as Y from 'yjs'
import { loopsOf } from '../../shared/room-doc/schema.js'
import { connectStream, makeRoom, makeUser, signIn, startLive, until, type Live } from '../realtime/live-helpers.js'
import { awarenessMessage, editUpdate, openRaw, syncMessage } from './raw-sync.js'

type Who = RoomRole | 'outsider' | 'signedOut'
const callers: Who[] = ['signedOut', 'outsider', 'viewer', 'reviewer', 'editor', 'owner']
const rank: Record<RoomRole, number> = { owner: 4, editor: 3, reviewer: 2, viewer: 1 }
type Rule = 'public' | 'user' | RoomRole
type Outcome = 'allowed' | 'signed-out' | 'hidden' | 'forbidden' | 'csrf' | 'server-error'

/** What the role table says a caller gets from a route guarded by `rule`. */
function expected(rule: Rule, who: Who): Outcome {
  if (rule === 'public') return 'allowed'
  if (who === 'signedOut') return 'signed-out'
  if (rule === 'user') return 'allowed'
  if (who === 'outsider') return 'hidden'
  return rank[who] >= rank[rule] ? 'allowed' : 'forbidden'
}

function outcomeOf(status: number, code: string | undefined): Outcome {
  if (status >= 500) return 'server-error'
  if (status === 401) return 'signed-out'
  if (status === 404 && code === 'room_not_found') return 'hidden'
  if (status === 403) return code === 'csrf_invalid' ? 'csrf' : 'forbidden'
  return 'allowed'
}

// Every route of the app, keyed as "METHOD path" exactly as the router stack spells it.
const routes: Record<string, Rule> = {
  'GET /api/health': 'public',
  'GET /api/auth/csrf': 'public',
  'GET /api/auth/me': 'public',
  'POST /api/auth/signup': 'public',
  'POST /api/auth/signin': 'public',
  'POST /api/auth/signout': 'public',
  'GET /api/rooms/': 'user',
  'POST /api/rooms/': 'user',
  'GET /api/rooms/:id': 'viewer',
  'PATCH /api/rooms/:id': 'editor',
  'DELETE /api/rooms/:id': 'owner',
  'GET /api/rooms/:id/members': 'viewer',
  'POST /api/rooms/:id/invites': 'owner',
  'GET /api/rooms/:id/invites': 'owner',
  'DELETE /api/rooms/:id/invites/:inviteId': 'owner',
  // A bearer link: anyone holding it may read it (invites README); accepting needs an account.
  'GET /api/invites/:token': 'public',
  'POST /api/invites/:token/accept': 'user',
  'PATCH /api/rooms/:id/members/:userId': 'owner',
  // Removing someone else is the owner's; any member may remove themselves (teamwork-roles tests that).
  'DELETE /api/rooms/:id/members/:userId': 'owner',
  'GET /api/rooms/:id/pins': 'viewer',
  'POST /api/rooms/:id/pins': 'reviewer',
  'POST /api/rooms/:id/pins/:pinId/replies': 'reviewer',
  'PATCH /api/rooms/:id/pins/:pinId': 'reviewer',
  'DELETE /api/rooms/:id/pins/:pinId': 'reviewer',
  'GET /api/rooms/:id/snapshots': 'viewer',
  'POST /api/rooms/:id/snapshots': 'editor',
  'GET /api/rooms/:id/snapshots/:sid': 'viewer',
  'GET /api/rooms/:id/snapshots/:sid/surface': 'viewer',
  'GET /api/rooms/:id/surface': 'viewer',
  'DELETE /api/rooms/:id/snapshots/:sid': 'editor',
  'POST /api/rooms/:id/frame/import': 'editor',
  'PUT /api/rooms/:id/underlay': 'editor',
  'GET /api/rooms/:id/underlay': 'viewer',
  'GET /api/rooms/:id/underlay/meta': 'viewer',
  'DELETE /api/rooms/:id/underlay': 'editor',
  'GET /api/rooms/:id/frame.json': 'viewer',
  'GET /api/rooms/:id/snapshots/:sid/frame.json': 'viewer',
  'GET /api/rooms/:id/surface.obj': 'viewer',
  'GET /api/rooms/:id/snapshots/:sid/surface.obj': 'viewer',
  'GET /api/rooms/:id/surface.stl': 'viewer',
  'GET /api/rooms/:id/snapshots/:sid/surface.stl': 'viewer',
  'GET /api/rooms/:id/figures.csv': 'viewer',
  'GET /api/rooms/:id/snapshots/:sid/figures.csv': 'viewer',
  // The rooms list's activity: the caller's own rooms only; one room's row and picture for its members.
  'GET /api/activity/rooms': 'user',
  'GET /api/activity/rooms/:id': 'viewer',
  'GET /api/activity/rooms/:id/thumbnail.png': 'viewer',
  // Outside production only (404 there); signed in, and each user sees only mail addressed to them.
  'GET /api/dev/mailbox': 'user',
  // The client app (SPA fallback), present when dist/ is built.
  'GET /{*path}': 'public',
}
const optionalRoutes = new Set(['GET /{*path}'])

/** Walks Express 5's router stack (router 2.x: layer.route, layer.rawPath of mounted routers). */
function enumerateRoutes(app: Express): string[] {
  const out: string[] = []
  const walk = (stack: any[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route)
        for (const m of Object.keys(layer.route.methods)) out.push(`${m.toUpperCase()} ${prefix}${layer.route.path}`)
      else if (Array.isArray(layer.handle?.stack))
        walk(layer.handle.stack, prefix + (layer.rawPath === '/' ? '' : String(layer.rawPath)))
    }
  }
  walk((app as any).router.stack, '')
  return out
}

// Names of the events the server listens to on client sockets, recorded as they are registered
// (the socket.io Server is internal to server/realtime; this sees it from outside).
const listened = new Set<string>()
const registerListener = ServerSocket.prototype.on
ServerSocket.prototype.on = function (this: ServerSocket, event: string, listener: (...args: any[]) => void) {
  listened.add(String(event))
  return registerListener.call(this, event as any, listener)
} as typeof ServerSocket.prototype.on

let live: Live
const cookies = {} as Record<Who, string>
const ids = {} as Record<Who, string>
const emails = {} as Record<Who, string>

beforeAll(async () => {
  live = await startLive()
  for (const who of callers) {
    if (who === 'signedOut') continue
    const u = await makeUser(live.running.dataSource, who)
    ids[who] = u.id
    emails[who] = u.email
    cookies[who] = await signIn(live.url, u.email)
  }
  cookies.signedOut = ''
})
afterAll(async () => {
  await live?.stop()
})

/** A room with one member per role (fresh per row, so a DELETE by the owner harms no other row). */
const castRoom = () =>
  makeRoom(
    live.running.dataSource,
    (['owner', 'editor', 'reviewer', 'viewer'] as const).map((role) => ({ userId: ids[role], role })),
  )

async function call(method: string, path: string, cookie: string): Promise<{ status: number; code?: string }> {
  const headers: Record<string, string> = { origin: live.url }
  if (cookie) headers.cookie = cookie
  if (method !== 'GET') {
    const csrf = await fetch(`${live.url}/api/auth/csrf`, { headers })
    const set = csrf.headers.getSetCookie()[0]?.split(';')[0]
    if (set) headers.cookie = set
    headers['x-csrf-token'] = ((await csrf.json()) as { token: string }).token
    headers['content-type'] = 'application/json'
  }
  const res = await fetch(live.url + path, { method, headers, body: method === 'GET' ? undefined : '{}' })
  const text = await res.text()
  let code: string | undefined
  try {
    code = (JSON.parse(text) as { error?: { code?: string } }).error?.code
  } catch {
    code = undefined
  }
  return { status: res.status, code }
}

function concretePath(pattern: string, roomId: string): string {
  return pattern
    .replace(':id', roomId)
    .replace(/:(inviteId|userId|pinId|sid)/, randomUUID())
    .replace(':token', 'A'.repeat(43))
    .replace('{*path}', 'rooms/somewhere')
}

describe('HTTP routes × callers', () => {
  it('has a row for every route the app serves (add one when you add a route)', () => {
    const served = enumerateRoutes(live.running.app)
    expect(served.filter((r) => !(r in routes))).toEqual([])
    expect(Object.keys(routes).filter((r) => !served.includes(r) && !optionalRoutes.has(r))).toEqual([])
  })

  it.each(Object.entries(routes))('%s (%s)', async (route, rule) => {
    const [method, pattern] = route.split(' ') as [string, string]
    const roomId = await castRoom()
    const got: Record<string, Outcome> = {}
    const want: Record<string, Outcome> = {}
    for (const who of callers) {
      // Sign-out would end the shared session: sign in afresh for that one call.
      const cookie =
        route === 'POST /api/auth/signout' && who !== 'signedOut' ? await signIn(live.url, emails[who]) : cookies[who]
      const reply = await call(method, concretePath(pattern, roomId), cookie)
      got[who] = outcomeOf(reply.status, reply.code)
      want[who] = expected(rule, who)
    }
    expect(got).toEqual(want)
  })
})

describe('socket.io events × callers', () => {
  // shared/protocol/events.ts: room:join and room:leave, and rooms:watch (a signed-in user's own
  // rooms list; it joins only that user's channel, so any signed-in caller may send it).
  const events = ['room:join', 'room:leave', 'rooms:watch']

  it('lists every event the server listens to on a client socket', async () => {
    const socket = connectStream(live.url, cookies.owner)
    try {
      await new Promise<void>(
        (resolve, reject) => (socket.once('connect', () => resolve()), socket.once('connect_error', reject)),
      )
      await until(() => listened.size > 0, 5000, 'server-side listeners')
      expect([...listened].filter((n) => !['disconnect', 'disconnecting', 'error'].includes(n)).sort()).toEqual(
        [...events].sort(),
      )
    } finally {
      socket.close()
    }
  })

  /** join → ack; then a room broadcast; leave; a second broadcast. Returns what the caller saw. */
  async function joinAndLeave(who: Who, roomId: string) {
    const socket = connectStream(live.url, cookies[who])
    const seen: string[] = []
    socket.on('pin:deleted', (p: { pinId: string }) => seen.push(p.pinId))
    try {
      const connected = await new Promise<string>((resolve) => {
        socket.once('connect', () => resolve('connected'))
        socket.once('connect_error', (err) => resolve(err.message))
      })
      if (connected !== 'connected') return { join: `refused: ${connected}`, leave: 'refused' }
      const ack = (await socket.timeout(10_000).emitWithAck('room:join', { roomId })) as {
        ok: boolean
        role?: string
        error?: { code: string }
      }
      // A round trip on the same connection: its answer is queued after anything the server sent or
      // processed before it, so "nothing arrived" is a fact once it is back (no sleeping and hoping).
      const roundTrip = () => socket.timeout(10_000).emitWithAck('room:join', { roomId: 'not-a-room' })
      live.realtime.emitToRoom(roomId, 'pin:deleted', { roomId, pinId: 'probe1' })
      await roundTrip()
      socket.emit('room:leave', { roomId })
      await roundTrip()
      live.realtime.emitToRoom(roomId, 'pin:deleted', { roomId, pinId: 'probe2' })
      await roundTrip()
      return { join: ack.ok ? `ok as ${ack.role}` : `refused: ${ack.error?.code}`, leave: seen.join(',') || 'none' }
    } finally {
      socket.close()
    }
  }

  it('room:join admits members with their role; room:leave stops broadcasts; others are refused', async () => {
    const roomId = await castRoom()
    const got: Record<string, unknown> = {}
    for (const who of callers) got[who] = await joinAndLeave(who, roomId)
    const member = (role: string) => ({ join: `ok as ${role}`, leave: 'probe1' })
    expect(got).toEqual({
      signedOut: { join: 'refused: signed_out', leave: 'refused' },
      outsider: { join: 'refused: room_not_found', leave: 'none' },
      viewer: member('viewer'),
      reviewer: member('reviewer'),
      editor: member('editor'),
      owner: member('owner'),
    })
  })
})

describe('sync message types × callers', () => {
  type Result = Record<'step1' | 'step2' | 'update' | 'awareness', string> | { upgrade: number }

  /** Sends one message of each type over a raw socket and reports what the server did with it. */
  async function probe(who: Who, roomId: string): Promise<Result> {
    const headers: Record<string, string> = { origin: live.url }
    if (cookies[who]) headers.cookie = cookies[who]
    const { status, peer } = await openRaw(live.url, roomId, headers)
    if (!peer) return { upgrade: status }
    try {
      const server = live.realtime.rooms.peek(roomId)!
      peer.send(syncMessage(0, new Uint8Array([0])))
      await until(() => peer.syncSeen.includes(1), 5000, 'sync step 2 answer')
      const step1 = peer.doc.getMap('frame').has('loops') ? 'answered' : 'empty answer'
      const first = () => (loopsOf(peer.doc).get(0).get('points') as Y.Array<Y.Map<number>>).get(0)
      const tagA = Math.round(Math.random() * 1e6) / 1e3 + 100
      const tagB = tagA + 1
      peer.send(
        syncMessage(
          1,
          editUpdate(peer.doc, () => first().set('z', tagA)),
        ),
      )
      peer.send(
        syncMessage(
          2,
          editUpdate(peer.doc, () => first().set('x', tagB)),
        ),
      )
      const { bytes, clientId } = awarenessMessage({
        user: { id: ids[who as RoomRole], name: who, color: '#888' },
        held: null,
      })
      peer.send(bytes)
      // One socket's messages are handled in order: once the awareness is in, the edits were handled.
      await until(() => server.awareness.getStates().has(clientId), 5000, 'awareness')
      await live.realtime.rooms.flush(server)
      const serverPoint = (loopsOf(server.doc).get(0).get('points') as any).get(0)
      return {
        step1,
        step2: serverPoint.get('z') === tagA ? 'applied' : 'dropped',
        update: serverPoint.get('x') === tagB ? 'applied' : 'dropped',
        awareness: 'applied',
      }
    } finally {
      peer.ws.close()
    }
  }

  it('writers apply every message; readers get answers and presence only; others never connect', async () => {
    const roomId = await castRoom()
    await live.realtime.ensureRoomFrame(roomId, 'blank')
    const got: Record<string, Result> = {}
    for (const who of callers) got[who] = await probe(who, roomId)
    const writer = { step1: 'answered', step2: 'applied', update: 'applied', awareness: 'applied' }
    const reader = { step1: 'answered', step2: 'dropped', update: 'dropped', awareness: 'applied' }
    expect(got).toEqual({
      signedOut: { upgrade: 401 },
      outsider: { upgrade: 404 },
      viewer: reader,
      reviewer: reader,
      editor: writer,
      owner: writer,
    })
  })
})
