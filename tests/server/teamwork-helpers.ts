import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import { loadConfig } from '../../server/config.js'
import { createDataSource } from '../../server/db/data-source.js'
import { MembershipEntity, type RoomRole } from '../../server/db/entities/index.js'
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp.js'
import { dbMailbox } from '../../server/mail/mailbox.js'
import type { Running } from '../../server/main.js'
import type { LiveRoomPort as RoomLive } from '../../server/live-room-port/index.js'
import type { VersionedSurface } from '../../shared/protocol/index.js'
import type { Frame, SurfaceResult } from '../../shared/types.js'
import { SESSION_COOKIE } from '../../server/session.js'
import { ApiClient, startTestServer } from '../helpers/test-server.js'

/** Records what the team-work routes ask of the live room, and forwards to the real one if any. */
export interface RecordingLive extends RoomLive {
  emitted: { roomId: string; event: string; payload: any }[]
  closed: { roomId?: string; userId?: string }[]
}

export function recordingLive(inner?: Partial<RoomLive>): RecordingLive {
  const live: RecordingLive = {
    emitted: [],
    closed: [],
    getRoomFrame: (roomId) => inner?.getRoomFrame?.(roomId) ?? Promise.resolve({ frame: null, version: 0 }),
    getLatestSurface: (roomId) => inner?.getLatestSurface?.(roomId) ?? Promise.resolve(null),
    emitToRoom(roomId, event, payload) {
      live.emitted.push({ roomId, event, payload })
      inner?.emitToRoom?.(roomId, event, payload)
    },
    closeRoomSockets(roomId, userId) {
      live.closed.push({ roomId, userId })
      inner?.closeRoomSockets?.(roomId, userId)
    },
    roomDeleted(roomId) {
      live.closed.push({ roomId })
      inner?.roomDeleted?.(roomId)
    },
    ensureRoomFrame: (roomId, starter) => inner?.ensureRoomFrame?.(roomId, starter) ?? Promise.resolve(false),
  }
  return live
}

export interface TeamworkServer {
  server: Running
  url: string
  live: RecordingLive
  smtp: FakeSmtp
  client: () => ApiClient
  stop: () => Promise<void>
}

/**
 * The real app on port 0 (team-work routes included), a fake SMTP server on a random port that
 * files mail into the test database (read back through GET /api/dev/mailbox), and the live room
 * replaced by a recording stand-in (optionally forwarding to `inner`).
 */
export async function startTeamworkServer(
  inner?: Partial<RoomLive>,
  env: Record<string, string> = {},
): Promise<TeamworkServer> {
  const config = loadConfig({ ...process.env, NODE_ENV: 'test' })
  const mailData = await createDataSource(config).initialize()
  const smtp = await startFakeSmtp(dbMailbox(mailData), 0)
  // createApp reads SMTP_* when it builds the team-work routes; each test file runs in its own process.
  process.env.SMTP_HOST = '127.0.0.1'
  process.env.SMTP_PORT = String(smtp.port)
  const live = recordingLive(inner)
  const server = await startTestServer({ live: () => live, env })
  return {
    server,
    url: server.url,
    live,
    smtp,
    client: () => new ApiClient(server.url),
    stop: async () => {
      await server.stop()
      await smtp.close()
      await mailData.destroy()
    },
  }
}

export interface RoomCast {
  roomId: string
  clients: Record<RoomRole | 'outsider' | 'signedOut', ApiClient>
  ids: Record<RoomRole | 'outsider', string>
}

/** A room with one signed-in member per role, an outsider and a signed-out client. */
export async function roomWithCast(tw: TeamworkServer, name = 'Courtyard canopy test room'): Promise<RoomCast> {
  const owner = tw.client()
  const ownerUser = await owner.signUpFresh('owner', 'Olga Owner')
  const room = await owner.post('/api/rooms', { name, description: 'test' })
  if (room.status !== 201) throw new Error(`room create failed: ${room.status}`)
  const roomId: string = room.body.room.id
  const clients = { owner } as RoomCast['clients']
  const ids = { owner: ownerUser.id } as RoomCast['ids']
  for (const role of ['editor', 'reviewer', 'viewer'] as const) {
    const c = tw.client()
    const u = await c.signUpFresh(role, `${role[0]!.toUpperCase()}${role.slice(1)} Person`)
    await addMember(tw.server.dataSource, roomId, u.id, role)
    clients[role] = c
    ids[role] = u.id
  }
  clients.outsider = tw.client()
  ids.outsider = (await clients.outsider.signUpFresh('outsider', 'Oscar Outsider')).id
  clients.signedOut = tw.client()
  return { roomId, clients, ids }
}

export async function addMember(dataSource: DataSource, roomId: string, userId: string, role: RoomRole): Promise<void> {
  await dataSource.getRepository(MembershipEntity).insert({ id: randomUUID(), roomId, userId, role })
}

// GET /api/dev/mailbox shows only the signed-in user's own mail (tests/security/dev-mailbox.test.ts),
// and an invitee often has no account yet: these helpers read the fake server's store directly.

/** The newest 500 messages with `to` among their recipients, straight from the store. */
async function stored(tw: TeamworkServer, to: string) {
  const wanted = to.toLowerCase()
  return (await dbMailbox(tw.server.dataSource).list(500)).filter((m) =>
    m.to.toLowerCase().split(', ').includes(wanted),
  )
}

/** Ids of the mail already delivered to `to`, so a test can wait for the next one. */
export async function mailIds(tw: TeamworkServer, to: string): Promise<Set<string>> {
  return new Set((await stored(tw, to)).map((m) => m.id))
}

/** The newest mail to `to` not in `seen`, waiting briefly (SMTP delivery is asynchronous). */
export async function mailTo(
  tw: TeamworkServer,
  to: string,
  seen = new Set<string>(),
): Promise<{ subject: string; text: string; html?: string }> {
  for (let i = 0; i < 50; i++) {
    const m = (await stored(tw, to)).find((x) => !seen.has(x.id))
    if (m) return m
    await new Promise((r) => setTimeout(r, 100))
  }
  throw new Error(`no new mail to ${to}`)
}

/** The invite token in a mail's link (43 base64url characters: newInviteToken's 32 bytes), or null. */
export const inviteTokenIn = (text: string): string | null => /\/invite\/([A-Za-z0-9_-]{43})\b/.exec(text)?.[1] ?? null

/** The owner of `cast` invites `email`; returns the route's reply, the mail caught and its token. */
export async function mailedInvite(tw: TeamworkServer, cast: RoomCast, email: string, role: string) {
  const seen = await mailIds(tw, email)
  const reply = await cast.clients.owner.post(`/api/rooms/${cast.roomId}/invites`, { email, role })
  if (reply.status !== 201) throw new Error(`invite failed: ${reply.status} ${JSON.stringify(reply.body)}`)
  const mail = await mailTo(tw, email, seen)
  const token = inviteTokenIn(mail.text)
  if (!token) throw new Error(`no invite link in: ${mail.text}`)
  return { reply, mail, token }
}

/**
 * Stands in for server/realtime in these API tests: one room frame with a version counter, solved
 * by the real engine (shared/engine.ts solveFrame) on demand, handed out as the live room does
 * (float32 vertices, uint32 triangles).
 */
export function engineLive(solve: (frame: Frame) => SurfaceResult) {
  let frame: Frame | null = null
  let version = 0
  let surface: VersionedSurface | null = null
  let settledVersion = -1
  return {
    setFrame(next: Frame | null, { settle = true } = {}) {
      frame = next
      version += 1
      if (settle) settledVersion = version
    },
    live: {
      getRoomFrame: async () => ({ frame, version }),
      getLatestSurface: async () => {
        if (!frame || settledVersion < 0) return null
        if (!surface || surface.version !== settledVersion) {
          const r = solve(frame)
          surface = {
            version: settledVersion,
            vertices: Float32Array.from(r.vertices.flat()),
            triangles: Uint32Array.from(r.triangles.flat()),
            figures: r.figures,
            solver: r.solver,
          }
        }
        return surface
      },
    } satisfies Partial<RoomLive>,
  }
}

function parseMaybeJson(text: string): any {
  try {
    return text ? JSON.parse(text) : null
  } catch {
    return text
  }
}

/** A multipart request as the signed-in client (its session cookie and CSRF token). */
export async function sendForm(client: ApiClient, method: 'POST' | 'PUT', path: string, form: FormData) {
  const token = (await client.get<{ token: string }>('/api/auth/csrf')).body.token
  const cookie = `${SESSION_COOKIE}=${client.cookie(SESSION_COOKIE) ?? ''}`
  const res = await fetch(client.baseUrl + path, { method, body: form, headers: { cookie, 'x-csrf-token': token } })
  const text = await res.text()
  return { status: res.status, body: parseMaybeJson(text), headers: res.headers }
}

/** A GET whose body is a file (text or bytes), with the response headers. */
export async function download(client: ApiClient, path: string) {
  const res = await fetch(client.baseUrl + path, {
    headers: { cookie: `${SESSION_COOKIE}=${client.cookie(SESSION_COOKIE) ?? ''}` },
  })
  return { status: res.status, bytes: Buffer.from(await res.arrayBuffer()), headers: res.headers }
}
