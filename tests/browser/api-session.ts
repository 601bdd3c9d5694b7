import { request, type APIRequestContext } from 'playwright-core'
import { baseUrl } from '../helpers/browser'

/**
 * A signed-in HTTP session for setting up browser tests through the API (playwright's request
 * context keeps the cookies; `storageState()` hands them to a browser context).
 */
export interface ApiSession {
  http: APIRequestContext
  /** JSON request with the CSRF token; throws with the server's error on a non-2xx answer. */
  call<T = unknown>(method: 'GET' | 'POST' | 'PATCH' | 'DELETE', path: string, body?: unknown): Promise<T>
  close(): Promise<void>
}

export async function apiSession(): Promise<ApiSession> {
  const http = await request.newContext({ baseURL: baseUrl() })
  let csrf: string | null = null
  const call = async <T>(method: string, path: string, body?: unknown): Promise<T> => {
    if (method !== 'GET' && !csrf) csrf = ((await (await http.get('/api/auth/csrf')).json()) as { token: string }).token
    const res = await http.fetch(path, {
      method,
      data: body,
      headers: method === 'GET' ? {} : { 'x-csrf-token': csrf! },
    })
    // Sign-in and sign-up start a new session, with a new token.
    if (/^\/api\/auth\/(signin|signup|signout)$/.test(path)) csrf = null
    const text = await res.text()
    if (!res.ok()) throw new Error(`${method} ${path} → ${res.status()}: ${text}`)
    return (text ? JSON.parse(text) : null) as T
  }
  return { http, call, close: () => http.dispose() }
}

/** Signs in an existing account. */
export async function signedIn(email: string, password: string): Promise<ApiSession> {
  const s = await apiSession()
  await s.call('POST', '/api/auth/signin', { email, password })
  return s
}

/** The invite link's token from the newest mail in the dev mailbox of the session's own account (it lists only mail addressed to the signed-in user). */
export async function inviteToken(s: ApiSession, email: string): Promise<string> {
  const { messages } = await s.call<{ messages: { text: string }[] }>('GET', '/api/dev/mailbox')
  const token = messages[0]?.text.match(/\/invite\/([A-Za-z0-9_-]{43})/)?.[1]
  if (!token) throw new Error(`no invite mail for ${email} in the dev mailbox`)
  return token
}

/** Signs up a new account and makes it a member of `roomId` with `role` through a real invite. */
export async function memberWithRole(
  owner: ApiSession,
  roomId: string,
  role: string,
  tag: string,
): Promise<ApiSession> {
  const email = `${tag}-${Date.now()}@example.test`
  const guest = await apiSession()
  await guest.call('POST', '/api/auth/signup', { name: `Wren ${tag}`, email, password: 'a long enough password' })
  await owner.call('POST', `/api/rooms/${roomId}/invites`, { email, role })
  await guest.call('POST', `/api/invites/${await inviteToken(guest, email)}/accept`)
  return guest
}
