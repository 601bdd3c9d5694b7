/**
 * Helpers for the live-room tests and benchmark: the real server on port 0 against the test
 * database (tests/helpers/test-server.ts, as scripts/test.mjs sets it up), users and rooms inserted
 * directly, sign-in over HTTP for a real session cookie, and real clients: y-websocket's
 * WebsocketProvider (with `ws` as its WebSocket) and socket.io-client.
 */
import { randomUUID } from 'node:crypto'
import bcrypt from 'bcryptjs'
import type { DataSource } from 'typeorm'
import { MembershipEntity, RoomEntity, UserEntity, type RoomRole } from '../../server/db/entities/index.js'
import type { Running } from '../../server/main.js'
import type { Realtime, RealtimeDeps } from '../../server/realtime/index.js'
import { startTestServer } from '../helpers/test-server.js'

// The clients import no server module, so browser tests load them without the server's graph.
export { connectDoc, connectStream, cookieSocket, type DocClient } from '../helpers/live-clients.js'

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
