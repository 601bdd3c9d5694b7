/**
 * Issue 12, item 9: input that used to answer 500 with a stack trace in the log. Each must be a 400
 * naming the problem, and the log must hold no trace. Percent-encoding per RFC 3986 §2.1 (a % and
 * two hex digits) whose bytes must be UTF-8 (ECMAScript decodeURIComponent); a JSON body must be
 * UTF-8 here (RFC 8259 §8.1 requires UTF-8 between systems; body-parser accepts only utf-*).
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { makeRoom, makeUser, signIn, startLive, type Live } from '../realtime/live-helpers.js'
import { openRaw } from './raw-sync.js'

let live: Live
let cookie: string
let roomId: string
const logged: string[] = []

beforeAll(async () => {
  live = await startLive()
  const u = await makeUser(live.running.dataSource, 'Prober')
  cookie = await signIn(live.url, u.email)
  roomId = await makeRoom(live.running.dataSource, [{ userId: u.id, role: 'owner' }])
  // The server logs in this process: keep every line it writes while the probes run.
  for (const method of ['error', 'warn', 'log'] as const) {
    vi.spyOn(console, method).mockImplementation((...args: unknown[]) => void logged.push(args.map(String).join(' ')))
  }
})
afterAll(async () => {
  vi.restoreAllMocks()
  await live?.stop()
})

async function csrf(): Promise<string> {
  const res = await fetch(`${live.url}/api/auth/csrf`, { headers: { cookie } })
  return ((await res.json()) as { token: string }).token
}

// The logger writes one JSON-escaped line: a stack shows as "\n    at …" inside it.
const noTraces = () =>
  expect(logged.filter((l) => /(\\n|\n)\s+at |request failed|upgrade failed|URIError|RangeError/.test(l))).toEqual([])

describe('malformed percent-encoding', () => {
  const bad = ['%E0%A4%A', '%ZZ', '%', '%C3', '%FF%FE']

  it.each(bad)('GET /api/rooms/%s… answers 400 bad_url, signed in or not', async (segment) => {
    for (const path of [
      `/api/rooms/${segment}`,
      `/api/rooms/${segment}/members`,
      `/api/rooms/${roomId}/snapshots/${segment}`,
    ]) {
      for (const headers of [{ cookie }, {}] as Record<string, string>[]) {
        const res = await fetch(live.url + path, { headers })
        const body = (await res.json()) as { error: { code: string; message: string } }
        expect([path, res.status, body.error.code]).toEqual([path, 400, 'bad_url'])
        expect(body.error.message).toMatch(/percent-encoding/)
      }
    }
    noTraces()
  })

  it.each(bad)('the /sync/%s upgrade is refused with 400', async (segment) => {
    const { status } = await openRaw(live.url, segment, { origin: live.url, cookie })
    expect(status).toBe(400)
    noTraces()
  })
})

describe('request bodies', () => {
  it.each(['latin1', 'iso-8859-1', 'shift_jis', 'utf-9'])(
    'JSON in charset %s → 400 unsupported_charset',
    async (charset) => {
      const res = await fetch(`${live.url}/api/auth/signin`, {
        method: 'POST',
        headers: { cookie, 'x-csrf-token': await csrf(), 'content-type': `application/json; charset=${charset}` },
        body: JSON.stringify({ email: 'a@b.test', password: 'x' }),
      })
      const body = (await res.json()) as { error: { code: string; message: string } }
      expect([res.status, body.error.code]).toEqual([400, 'unsupported_charset'])
      expect(body.error.message).toContain(`"${charset}"`)
      expect(body.error.message).toMatch(/UTF-8/)
      noTraces()
    },
  )

  it('a deeply nested array as the sign-in e-mail → 400 naming the field, and the server carries on', async () => {
    const depth = 200_000
    const email = '['.repeat(depth) + ']'.repeat(depth)
    const res = await fetch(`${live.url}/api/auth/signin`, {
      method: 'POST',
      headers: { cookie, 'x-csrf-token': await csrf(), 'content-type': 'application/json' },
      body: `{"email":${email},"password":"x"}`,
    })
    const body = (await res.json()) as { error: { code: string; field?: string; message: string } }
    expect(res.status).toBe(400)
    expect(body.error.field).toBe('email')
    expect(body.error.message).toMatch(/^email: .*nests more than 32 levels/)
    // Shallow nesting gets past the depth guard to the schema, which names the field too.
    const shallow = await fetch(`${live.url}/api/auth/signin`, {
      method: 'POST',
      headers: { cookie, 'x-csrf-token': await csrf(), 'content-type': 'application/json' },
      body: JSON.stringify({ email: [[[['a@b.test']]]], password: 'x' }),
    })
    expect(shallow.status).toBe(400)
    expect(((await shallow.json()) as { error: { field?: string } }).error.field).toBe('email')
    expect((await fetch(`${live.url}/api/health`)).status).toBe(200)
    noTraces()
  })
})
