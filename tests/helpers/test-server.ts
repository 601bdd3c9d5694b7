import { randomUUID } from 'node:crypto'
import { loadConfig } from '../../server/config.js'
import { start, type Running, type StartOptions } from '../../server/main.js'

// Every test signs up and creates rooms from 127.0.0.1: the abuse limits are raised unless a test
// passes its own (tests/security/abuse-limits.test.ts does).
const roomyLimits = {
  RATE_SIGNUPS_PER_HOUR: '100000',
  RATE_ROOMS_PER_HOUR: '100000',
  RATE_INVITES_PER_HOUR: '100000',
  RATE_SIGNIN_FAILURES_PER_IP: '100000',
}

/**
 * Starts the real app on port 0 against the per-run test database that scripts/test.mjs creates
 * (DB_PORT 3308, DB_NAME veilroom_test_<time>). Refuses any other database, so a test can never
 * write into development data. `env` overrides variables for this server (e.g. the abuse limits).
 */
export async function startTestServer(
  options: Pick<StartOptions, 'tuning' | 'live'> & { env?: Record<string, string> } = {},
): Promise<Running> {
  const { env = {}, ...startOptions } = options
  const config = loadConfig({
    ...process.env,
    ...roomyLimits,
    NODE_ENV: 'test',
    LOG_LEVEL: process.env.LOG_LEVEL ?? 'warn',
    ...env,
  })
  if (!config.DB_NAME.startsWith('veilroom_test_')) {
    throw new Error(`DB_NAME=${config.DB_NAME} is not a test database; run tests with \`npm test\` (see DEVELOPERS.md)`)
  }
  return start({ ...startOptions, port: 0, config })
}

/** An address nobody else in this run uses. */
export const uniqueEmail = (tag = 'user') => `${tag}-${randomUUID().slice(0, 8)}@test.veilroom.test`

export interface ApiReply<T = any> {
  status: number
  body: T
  headers: Headers
}

/**
 * A browser-like HTTP client: keeps cookies, fetches a CSRF token before the first
 * state-changing request and again after sign-in / sign-out (the session is regenerated).
 */
export class ApiClient {
  private cookies = new Map<string, string>()
  private csrf: string | null = null

  constructor(readonly baseUrl: string) {}

  /** The session cookie value, to check that sign-in issues a new session id. */
  cookie(name: string): string | undefined {
    return this.cookies.get(name)
  }

  async request<T = any>(
    method: string,
    path: string,
    body?: unknown,
    opts: { csrf?: boolean } = {},
  ): Promise<ApiReply<T>> {
    const headers: Record<string, string> = {}
    if (body !== undefined) headers['content-type'] = 'application/json'
    const unsafe = !['GET', 'HEAD', 'OPTIONS'].includes(method)
    if (unsafe && opts.csrf !== false) headers['x-csrf-token'] = await this.token()
    if (this.cookies.size) headers.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
    const res = await fetch(this.baseUrl + path, {
      method,
      headers,
      body: body === undefined ? undefined : JSON.stringify(body),
    })
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';')
      const eq = pair?.indexOf('=') ?? -1
      if (pair && eq > 0) this.cookies.set(pair.slice(0, eq), pair.slice(eq + 1))
    }
    if (/^\/api\/auth\/(signin|signup|signout)$/.test(path)) this.csrf = null
    const text = await res.text()
    return { status: res.status, body: text ? JSON.parse(text) : null, headers: res.headers }
  }

  get = <T = any>(path: string) => this.request<T>('GET', path)
  post = <T = any>(path: string, body?: unknown) => this.request<T>('POST', path, body ?? {})
  patch = <T = any>(path: string, body?: unknown) => this.request<T>('PATCH', path, body ?? {})
  delete = <T = any>(path: string) => this.request<T>('DELETE', path)

  private async token(): Promise<string> {
    if (!this.csrf) this.csrf = (await this.get<{ token: string }>('/api/auth/csrf')).body.token
    return this.csrf
  }

  /** Signs up a fresh account and stays signed in; returns its e-mail and password. */
  async signUpFresh(tag = 'user', name = 'Test Person'): Promise<{ id: string; email: string; password: string }> {
    const email = uniqueEmail(tag)
    const password = 'correct-horse-' + randomUUID().slice(0, 6)
    const reply = await this.post('/api/auth/signup', { email, name, password })
    if (reply.status !== 201) throw new Error(`signup failed: ${reply.status} ${JSON.stringify(reply.body)}`)
    return { id: reply.body.user.id, email, password }
  }
}
