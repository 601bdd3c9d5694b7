import bcrypt from 'bcryptjs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { UserEntity } from '../../server/db/entities/index.js'
import type { Running } from '../../server/main.js'
import { SIGNIN_FAILURE_LIMIT } from '../../server/modules/auth/auth-routes.js'
import { SESSION_COOKIE } from '../../server/session.js'
import { ApiClient, startTestServer, uniqueEmail } from '../helpers/test-server.js'

let server: Running
beforeAll(async () => {
  server = await startTestServer()
})
afterAll(async () => {
  await server?.stop()
})

const client = () => new ApiClient(server.url)

describe('sign-up, sign-in, sign-out', () => {
  it('signs up, is signed in at once, and never returns the password hash', async () => {
    const c = client()
    const email = uniqueEmail('signup')
    const reply = await c.post('/api/auth/signup', {
      email: email.toUpperCase(),
      name: 'Ada Tensile',
      password: 'long-enough-pass',
    })
    expect(reply.status).toBe(201)
    expect(reply.body.user).toEqual({ id: expect.any(String), email, name: 'Ada Tensile' })
    expect(JSON.stringify(reply.body)).not.toMatch(/hash|long-enough-pass/)
    expect((await c.get('/api/auth/me')).body.user.email).toBe(email)
  })

  it('refuses a short password and a taken e-mail, naming the field', async () => {
    const c = client()
    const short = await c.post('/api/auth/signup', { email: uniqueEmail(), name: 'A', password: 'short' })
    expect(short.status).toBe(400)
    expect(short.body.error).toMatchObject({ code: 'invalid_input', field: 'password' })
    const { email } = await c.signUpFresh('taken')
    const again = await client().post('/api/auth/signup', { email, name: 'B', password: 'another-password' })
    expect(again.status).toBe(409)
    expect(again.body.error).toMatchObject({ code: 'email_taken', field: 'email' })
  })

  it('answers 401 bad_credentials for a wrong password and for an unknown e-mail', async () => {
    const { email } = await client().signUpFresh('wrongpw')
    const wrong = await client().post('/api/auth/signin', { email, password: 'not-the-password' })
    expect(wrong.status).toBe(401)
    expect(wrong.body.error.code).toBe('bad_credentials')
    const unknown = await client().post('/api/auth/signin', { email: uniqueEmail('nobody'), password: 'whatever-pass' })
    expect(unknown.status).toBe(401)
  })

  // Session fixation defence (OWASP Session Management Cheat Sheet): a new session id at sign-in.
  it('issues a new session id at sign-in and forgets the user at sign-out', async () => {
    const { email, password } = await client().signUpFresh('fixation')
    const c = client()
    await c.get('/api/auth/csrf')
    const before = c.cookie(SESSION_COOKIE)
    expect(before).toBeDefined()
    const signIn = await c.post('/api/auth/signin', { email, password })
    expect(signIn.status).toBe(200)
    expect(signIn.body.user.email).toBe(email)
    expect(c.cookie(SESSION_COOKIE)).not.toBe(before)
    expect((await c.get('/api/auth/me')).body.user.email).toBe(email)
    expect((await c.post('/api/auth/signout')).status).toBe(204)
    expect((await c.get('/api/auth/me')).body).toEqual({ user: null })
  })

  it('sets the session cookie httpOnly and SameSite=Lax', async () => {
    const reply = await client().get('/api/auth/csrf')
    const cookie = reply.headers.getSetCookie().find((c) => c.startsWith(SESSION_COOKIE + '='))
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
  })
})

describe('CSRF protection (synchroniser token, OWASP CSRF Prevention Cheat Sheet)', () => {
  it('refuses a state-changing request without the x-csrf-token header', async () => {
    const c = client()
    await c.get('/api/auth/csrf')
    const reply = await c.request(
      'POST',
      '/api/auth/signup',
      { email: uniqueEmail(), name: 'N', password: 'long-enough-pass' },
      { csrf: false },
    )
    expect(reply.status).toBe(403)
    expect(reply.body.error.code).toBe('csrf_invalid')
  })

  it('refuses a token from another session', async () => {
    const other = (await client().get('/api/auth/csrf')).body.token as string
    const c = client()
    await c.get('/api/auth/csrf')
    const res = await fetch(server.url + '/api/rooms', {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-csrf-token': other },
      body: JSON.stringify({ name: 'x' }),
    })
    expect(res.status).toBe(403)
  })
})

describe('sign-in rate limit', () => {
  it(`answers 429 rate_limited after ${SIGNIN_FAILURE_LIMIT} failures for one IP + e-mail`, async () => {
    const { email, password } = await client().signUpFresh('limited')
    const c = client()
    for (let i = 0; i < SIGNIN_FAILURE_LIMIT; i++) {
      expect((await c.post('/api/auth/signin', { email, password: 'wrong-password-' + i })).status).toBe(401)
    }
    const blocked = await c.post('/api/auth/signin', { email, password })
    expect(blocked.status).toBe(429)
    expect(blocked.body.error.code).toBe('rate_limited')
    // Another e-mail from the same IP is not locked out by someone guessing this one.
    const other = await client().signUpFresh('unlimited')
    expect((await client().post('/api/auth/signin', { email: other.email, password: other.password })).status).toBe(200)
  })
})

describe('password storage', () => {
  // OWASP Password Storage Cheat Sheet: bcrypt with a work factor of at least 10 (recalled from memory).
  it('stores a bcrypt hash of cost ≥ 10 that verifies the password', async () => {
    const { email, password } = await client().signUpFresh('hash')
    const user = await server.dataSource.getRepository(UserEntity).findOneByOrFail({ email })
    expect(user.passwordHash).toMatch(/^\$2[aby]\$\d\d\$/)
    expect(bcrypt.getRounds(user.passwordHash)).toBeGreaterThanOrEqual(10)
    expect(await bcrypt.compare(password, user.passwordHash)).toBe(true)
    expect(await bcrypt.compare(password + 'x', user.passwordHash)).toBe(false)
  })
})

describe('health and errors', () => {
  it('reports the database up', async () => {
    const body = (await client().get('/api/health')).body
    // One process: no Redis; `instance` names this process (server/scale README).
    expect(body).toMatchObject({ ok: true, db: 'up', redis: 'off' })
    expect(typeof body.instance).toBe('string')
  })

  it('answers unknown API paths and bad JSON in the error shape', async () => {
    const missing = await client().get('/api/no-such-thing')
    expect(missing.status).toBe(404)
    expect(missing.body.error.code).toBe('not_found')
    const c = client()
    const token = (await c.get('/api/auth/csrf')).body.token as string
    const res = await fetch(server.url + '/api/auth/signin', {
      method: 'POST',
      headers: {
        'content-type': 'application/json',
        'x-csrf-token': token,
        cookie: `${SESSION_COOKIE}=${c.cookie(SESSION_COOKIE)}`,
      },
      body: '{"email":',
    })
    expect(res.status).toBe(400)
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe('invalid_json')
  })
})
