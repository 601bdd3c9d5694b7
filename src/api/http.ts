import type { z } from 'zod'
import type { StarterKey } from '../../shared/room-doc/starters'
import { errorBody, replies, type Member, type RoomDetail, type RoomSummary, type User } from './schemas'

export type { Member, RoomDetail, RoomRole, RoomSummary, User } from './schemas'

/** A failed API call: the server's error code and message, the input field at fault if any. */
export class ApiError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly field: string | undefined,
    /** HTTP status; 0 when the server could not be reached or replied with something unreadable. */
    readonly status: number,
  ) {
    super(message)
    this.name = 'ApiError'
  }
}

type Method = 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE'

// The token is tied to the session, and the server regenerates the session at sign-in and
// sign-out, so the cached token is dropped whenever that happens.
let csrfToken: string | null = null

/** Forget the cached CSRF token; the next unsafe request fetches a fresh one. */
export function forgetCsrfToken(): void {
  csrfToken = null
}

async function csrf(): Promise<string> {
  csrfToken ??= (await call('GET', '/api/auth/csrf', undefined, replies.csrf)).token
  return csrfToken
}

// Set by main.ts: what to do when the server says our session has ended (expired, signed out in
// another tab). Kept as a hook so this module never imports the router or a store.
let onSignedOut: (() => void) | null = null

/** Register the reaction to a 401 'signed_out' from any call other than sign-in itself. */
export function setSignedOutHandler(handler: (() => void) | null): void {
  onSignedOut = handler
}

function isCsrfRefusal(err: unknown): boolean {
  return err instanceof ApiError && err.status === 403 && /csrf/i.test(err.code)
}

async function call<T>(method: Method, path: string, body: unknown, reply: z.ZodType<T> | null): Promise<T> {
  const headers: Record<string, string> = { accept: 'application/json' }
  // uploads go as multipart: the browser sets that content type with its boundary
  const form = body instanceof FormData
  if (body !== undefined && !form) headers['content-type'] = 'application/json'
  if (method !== 'GET') headers['x-csrf-token'] = await csrf()
  let res: Response
  try {
    res = await fetch(path, {
      method,
      headers,
      credentials: 'same-origin',
      body: body === undefined ? undefined : form ? body : JSON.stringify(body),
    })
  } catch {
    throw new ApiError(
      'network',
      'The Veilroom server could not be reached. Check your connection and try again.',
      undefined,
      0,
    )
  }
  if (!res.ok) {
    const err = await readError(res)
    if (err.status === 401 && err.code === 'signed_out') onSignedOut?.()
    throw err
  }
  if (reply === null) return undefined as T
  const parsed = reply.safeParse(await res.json().catch(() => undefined))
  if (!parsed.success) {
    throw new ApiError('bad_reply', `The server's reply to ${method} ${path} was not understood.`, undefined, 0)
  }
  return parsed.data
}

async function readError(res: Response): Promise<ApiError> {
  const parsed = errorBody.safeParse(await res.json().catch(() => undefined))
  if (parsed.success) {
    const { code, message, field } = parsed.data.error
    return new ApiError(code, message, field, res.status)
  }
  // a body cut off by a size limit may come back without our error shape
  if (res.status === 413) return new ApiError('too_large', 'The file is too large for the server.', undefined, 413)
  return new ApiError(
    `http_${res.status}`,
    `The server answered ${res.status} ${res.statusText}`.trim(),
    undefined,
    res.status,
  )
}

/**
 * Send a request (JSON, or FormData for uploads); a CSRF refusal (expired session) is retried once
 * with a fresh token. Every module in src/api sends through here.
 */
export async function request<T>(method: Method, path: string, body: unknown, reply: z.ZodType<T> | null): Promise<T> {
  try {
    return await call(method, path, body, reply)
  } catch (err) {
    if (method === 'GET' || !isCsrfRefusal(err)) throw err
    forgetCsrfToken()
    return call(method, path, body, reply)
  }
}

const room = (id: string): string => `/api/rooms/${encodeURIComponent(id)}`

/** GET /api/health: is the server up and can it reach the database. */
export const health = () => request('GET', '/api/health', undefined, replies.health)

/** GET /api/auth/me: the signed-in user, or null. */
export const me = async (): Promise<User | null> => (await request('GET', '/api/auth/me', undefined, replies.me)).user

/** POST /api/auth/signin. */
export async function signIn(input: { email: string; password: string }): Promise<User> {
  const { user } = await request('POST', '/api/auth/signin', input, replies.user)
  forgetCsrfToken()
  return user
}

/** POST /api/auth/signup: creates the account and signs it in. */
export async function signUp(input: { email: string; name: string; password: string }): Promise<User> {
  const { user } = await request('POST', '/api/auth/signup', input, replies.user)
  forgetCsrfToken()
  return user
}

/** POST /api/auth/signout. */
export async function signOut(): Promise<void> {
  await request('POST', '/api/auth/signout', undefined, null)
  forgetCsrfToken()
}

/** GET /api/rooms: the rooms I am a member of, with my role in each. */
export const listRooms = async (): Promise<RoomSummary[]> =>
  (await request('GET', '/api/rooms', undefined, replies.rooms)).rooms

/** POST /api/rooms: I become its owner. */
export const createRoom = async (input: {
  name: string
  description: string
  starter?: StarterKey
}): Promise<RoomDetail> => (await request('POST', '/api/rooms', input, replies.room)).room

/** GET /api/rooms/:id. */
export const getRoom = async (id: string): Promise<RoomDetail> =>
  (await request('GET', room(id), undefined, replies.room)).room

/** PATCH /api/rooms/:id (owner or editor). */
export const updateRoom = async (id: string, patch: { name?: string; description?: string }): Promise<RoomDetail> =>
  (await request('PATCH', room(id), patch, replies.room)).room

/** DELETE /api/rooms/:id (owner only). */
export const deleteRoom = (id: string): Promise<void> => request('DELETE', room(id), undefined, null)

/** GET /api/rooms/:id/members. */
export const listMembers = async (id: string): Promise<Member[]> =>
  (await request('GET', `${room(id)}/members`, undefined, replies.members)).members
