/**
 * Helpers for the live-room tests and benchmark: the real server on port 0 against the test
 * database (tests/helpers/test-server.ts, as scripts/test.mjs sets it up), users and rooms inserted
 * directly, sign-in over HTTP for a real session cookie, and real clients: y-websocket's
 * WebsocketProvider (with `ws` as its WebSocket) and socket.io-client.
 */
import { randomUUID } from 'node:crypto'
import bcrypt from 'bcryptjs'
import { io as ioClient, type Socket } from 'socket.io-client'
import type { DataSource } from 'typeorm'
import WebSocket from 'ws'
import { WebsocketProvider } from 'y-websocket'
import * as Y from 'yjs'
import { MembershipEntity, RoomEntity, UserEntity, type RoomRole } from '../../server/db/entities/index.js'
import type { Running } from '../../server/main.js'
import type { Realtime, RealtimeDeps } from '../../server/realtime/index.js'
import { startTestServer } from '../helpers/test-server.js'

export interface Live {
  running: Running
  realtime: Realtime
  url: string
  stop: () => Promise<void>
}

/** Starts the app (its live room included) with the given realtime tuning. */
export async function startLive(tuning: RealtimeDeps['tuning'] = {}): Promise<Live> {
  const running = await startTestServer({ tuning })
  return { running, realtime: running.realtime, url: running.url, stop: () => running.stop() }
}

/** The password of every user makeUser inserts. */
export const PASSWORD = 'live-room-test-password'

/** Inserts a user named `name` (bcrypt cost 4: these tests are about sockets, not password storage). */
export async function makeUser(ds: DataSource, name: string): Promise<{ id: string; email: string }> {
  const id = randomUUID()
  const email = `${name.toLowerCase().replace(/[^a-z0-9]+/g, '-')}-${id.slice(0, 8)}@live.veilroom.test`
  await ds.getRepository(UserEntity).insert({ id, email, name, passwordHash: await bcrypt.hash(PASSWORD, 4) })
  return { id, email }
}

/** Inserts a room with the given members. */
export async function makeRoom(ds: DataSource, members: { userId: string; role: RoomRole }[]): Promise<string> {
  const id = randomUUID()
  await ds.getRepository(RoomEntity).insert({ id, name: `Live test ${id.slice(0, 8)}`, description: '' })
  for (const m of members)
    await ds.getRepository(MembershipEntity).insert({ id: randomUUID(), roomId: id, userId: m.userId, role: m.role })
  return id
}

/** Signs in over HTTP and returns the session cookie ("name=value"). */
export async function signIn(url: string, email: string): Promise<string> {
  const csrf = await fetch(`${url}/api/auth/csrf`)
  const first = cookieOf(csrf)
  const { token } = (await csrf.json()) as { token: string }
  const res = await fetch(`${url}/api/auth/signin`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': token, cookie: first },
    body: JSON.stringify({ email, password: PASSWORD }),
  })
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`)
  return cookieOf(res) || first
}

/** Inserts a user and signs them in: id, e-mail and the session cookie. */
export async function signedInUser(
  live: Pick<Live, 'running' | 'url'>,
  name: string,
): Promise<{ id: string; email: string; cookie: string }> {
  const u = await makeUser(live.running.dataSource, name)
  return { ...u, cookie: await signIn(live.url, u.email) }
}

/** A JSON API call with a session cookie (and that session's CSRF token); throws on a non-2xx answer. */
export async function apiAs<T = Record<string, unknown>>(
  url: string,
  cookie: string,
  method: string,
  path: string,
  body?: unknown,
): Promise<T> {
  const headers: Record<string, string> = { cookie, 'content-type': 'application/json' }
  if (method !== 'GET') {
    const csrf = await fetch(`${url}/api/auth/csrf`, { headers: { cookie } })
    headers['x-csrf-token'] = ((await csrf.json()) as { token: string }).token
  }
  const res = await fetch(url + path, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) })
  if (!res.ok) throw new Error(`${method} ${path}: ${res.status} ${await res.text()}`)
  return (await res.json()) as T
}

function cookieOf(res: Response): string {
  const set = res.headers.getSetCookie()[0]
  return set ? set.split(';')[0]! : ''
}

/** A WebSocket class for y-websocket that sends our cookie and Origin. */
export function cookieSocket(
  cookie: string,
  origin: string,
): new (address: string | URL, protocols?: string | string[]) => WebSocket {
  return class extends WebSocket {
    constructor(address: string | URL, protocols?: string | string[]) {
      super(address, protocols, { headers: { cookie, origin } })
    }
  }
}

export interface DocClient {
  doc: Y.Doc
  provider: WebsocketProvider
  synced: Promise<void>
  destroy: () => void
}

/** A y-websocket client of a room; `synced` resolves after the server's sync step 2. */
export function connectDoc(url: string, roomId: string, cookie: string): DocClient {
  const doc = new Y.Doc()
  const provider = new WebsocketProvider(url.replace(/^http/, 'ws') + '/sync', roomId, doc, {
    WebSocketPolyfill: cookieSocket(cookie, url) as unknown as typeof globalThis.WebSocket,
    disableBc: true,
  })
  // Each provider adds a process 'exit' listener that clears its awareness as the process ends;
  // a test or benchmark holds dozens at once (Node warns past 10), and the server drops a closed
  // socket's awareness itself, so the listener buys nothing here.
  process.off('exit', provider._exitHandler)
  const synced = new Promise<void>((resolve) => {
    if (provider.synced) resolve()
    else provider.once('sync', () => resolve())
  })
  return {
    doc,
    provider,
    synced,
    destroy: () => {
      provider.destroy()
      doc.destroy()
    },
  }
}

/** A socket.io client of the surface stream, signed in through the cookie. */
export function connectStream(url: string, cookie: string): Socket {
  return ioClient(url, {
    transports: ['websocket'],
    extraHeaders: { cookie, origin: url },
    forceNew: true,
    reconnection: false,
  })
}

/**
 * Whether a vertex lies within `tol` of (x, y, z): the mesh contract (shared/mesh/README.md) makes
 * every frame point a mesh vertex, so a solved surface passes through each point of its frame.
 */
export function hasVertexNear(vertices: Float32Array, x: number, y: number, z: number, tol = 1e-4): boolean {
  for (let i = 0; i < vertices.length; i += 3) {
    if (
      Math.abs(vertices[i]! - x) < tol &&
      Math.abs(vertices[i + 1]! - y) < tol &&
      Math.abs(vertices[i + 2]! - z) < tol
    )
      return true
  }
  return false
}

/**
 * Polls `check` (sync, or async such as an HTTP or database read) every `every` ms until it is true;
 * fails after `ms` naming `what`.
 */
export async function until(
  check: () => boolean | Promise<boolean>,
  ms = 10_000,
  what = 'condition',
  every = 10,
): Promise<void> {
  const end = Date.now() + ms
  while (!(await check())) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`)
    await new Promise((r) => setTimeout(r, every))
  }
}
