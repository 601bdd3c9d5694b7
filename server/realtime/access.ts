/**
 * Who is on the other end of a websocket or socket.io connection: the signed-in user (from the
 * session cookie, through the same express-session and passport middleware the routes use), the
 * allowed Origins, and the user's role in a room.
 */
import { ServerResponse, type IncomingMessage } from 'node:http'
import type { RequestHandler } from 'express'
import type { DataSource } from 'typeorm'
import { MembershipEntity, type RoomRole } from '../db/entities/index.js'

export interface SessionUser {
  id: string
  name: string
}

export interface AccessDeps {
  sessionMiddleware: RequestHandler
  /** passport's session middleware: turns the stored user id into req.user (re-read from the DB). */
  passportSession: RequestHandler
  dataSource: DataSource
}

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i

/** A room id as the API hands them out (UUID), lower-cased; undefined for anything else. */
export function parseRoomId(raw: unknown): string | undefined {
  return typeof raw === 'string' && uuidPattern.test(raw) ? raw.toLowerCase() : undefined
}

/** Runs the session and passport middleware on a raw request; resolves to the user or null. */
export function sessionUser(req: IncomingMessage, deps: AccessDeps): Promise<SessionUser | null> {
  // A response object that is never sent: express-session only hooks its header writes.
  const res = new ServerResponse(req)
  type Express = Parameters<RequestHandler>
  const r = req as unknown as Express[0]
  const s = res as unknown as Express[1]
  return new Promise((resolve, reject) => {
    deps.sessionMiddleware(r, s, (err?: unknown) => {
      if (err) return reject(err instanceof Error ? err : new Error(String(err)))
      deps.passportSession(r, s, (err2?: unknown) => {
        if (err2) return reject(err2 instanceof Error ? err2 : new Error(String(err2)))
        const user = (req as { user?: { id?: unknown; name?: unknown } }).user
        resolve(user && typeof user.id === 'string' ? { id: user.id, name: String(user.name ?? '') } : null)
      })
    })
  })
}

/** The user's role in a room, or null when they are not a member (or the room does not exist). */
export async function roomRoleOf(ds: DataSource, roomId: string, userId: string): Promise<RoomRole | null> {
  const m = await ds.getRepository(MembershipEntity).findOneBy({ roomId, userId })
  return m ? m.role : null
}

/**
 * Origins a browser may open our sockets from: the public URL, and in development also the Vite
 * dev server (default port 5173).
 */
export function allowedOrigins(publicUrl: string, nodeEnv: string): Set<string> {
  const origins = new Set([new URL(publicUrl).origin])
  if (nodeEnv !== 'production') for (const host of ['localhost', '127.0.0.1']) origins.add(`http://${host}:5173`)
  return origins
}
