/**
 * Hostile HTTP: bodies over the limits, uploads that stall, invite tokens that are not tokens.
 * Expected answers are our own API contract (server/lib/error-handler.ts: 413 too_large; the
 * invites README: an unknown or malformed link is a plain 404 invite_not_found, never a hint of
 * why), and Node's http server timeouts (nodejs.org/api/http.html: requestTimeout 300 s and
 * headersTimeout 60 s by default) as the cut-off for a slow upload.
 */
import { connect } from 'node:net'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { makeRoom, makeUser, signIn, startLive, type Live } from '../realtime/live-helpers.js'

let live: Live
let cookie: string
let roomId: string

beforeAll(async () => {
  live = await startLive()
  const u = await makeUser(live.running.dataSource, 'Uploader')
  cookie = await signIn(live.url, u.email)
  roomId = await makeRoom(live.running.dataSource, [{ userId: u.id, role: 'owner' }])
})
afterAll(async () => {
  await live?.stop()
})

async function csrf(): Promise<string> {
  const res = await fetch(`${live.url}/api/auth/csrf`, { headers: { cookie } })
  return ((await res.json()) as { token: string }).token
}

describe('oversized bodies', () => {
  it('answers 413 too_large to a JSON body over 1 MB', async () => {
    const body = JSON.stringify({ name: 'x'.repeat(1024 * 1024 + 10) })
    const res = await fetch(`${live.url}/api/rooms`, {
      method: 'POST',
      body,
      headers: { cookie, 'x-csrf-token': await csrf(), 'content-type': 'application/json' },
    })
    expect(res.status).toBe(413)
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe('too_large')
  })

  it('answers 413 too_large naming the field to an underlay image over 4 MB', async () => {
    const form = new FormData()
    form.append('image', new Blob([new Uint8Array(4 * 1024 * 1024 + 1)]), 'huge.png')
    const res = await fetch(`${live.url}/api/rooms/${roomId}/underlay`, {
      method: 'PUT',
      body: form,
      headers: { cookie, 'x-csrf-token': await csrf() },
    })
    expect(res.status).toBe(413)
    expect(await res.json()).toMatchObject({ error: { code: 'too_large', field: 'image' } })
  })
})

describe('slow uploads', () => {
  it('keeps serving while uploads stall mid-body, and has finite request and header timeouts', async () => {
    const token = await csrf()
    const url = new URL(live.url)
    const stalled = await Promise.all(
      Array.from(
        { length: 20 },
        () =>
          new Promise<ReturnType<typeof connect>>((resolve) => {
            const socket = connect(Number(url.port), url.hostname, () => {
              socket.write(
                `POST /api/rooms/${roomId}/frame/import HTTP/1.1\r\nHost: ${url.host}\r\nCookie: ${cookie}\r\nX-CSRF-Token: ${token}\r\n` +
                  'Content-Type: multipart/form-data; boundary=XyZ\r\nContent-Length: 900000\r\n\r\n' +
                  '--XyZ\r\nContent-Disposition: form-data; name="file"; filename="f.json"\r\n\r\n{"loops":[',
              )
              resolve(socket)
            })
            socket.on('error', () => undefined)
          }),
      ),
    )
    try {
      // Twenty stalled uploads hold no worker: other requests are answered at once.
      for (let i = 0; i < 5; i++) expect((await fetch(`${live.url}/api/health`)).status).toBe(200)
      const rooms = await fetch(`${live.url}/api/rooms`, { headers: { cookie } })
      expect(rooms.status).toBe(200)
      // A stalled upload is cut by Node's request timeout; 0 would mean "never" (slowloris).
      const server = live.running.server
      expect(server.requestTimeout).toBeGreaterThan(0)
      expect(server.requestTimeout).toBeLessThanOrEqual(300_000)
      expect(server.headersTimeout).toBeGreaterThan(0)
      expect(server.headersTimeout).toBeLessThanOrEqual(60_000)
    } finally {
      for (const s of stalled) s.destroy()
    }
  })
})

describe('invite tokens that are not tokens', () => {
  const tokens: [string, string][] = [
    ['garbage', 'hello'],
    ['too long', 'A'.repeat(5000)],
    ['wrong alphabet, right length', '!'.repeat(43)],
    ['a path trick', '..%2F..%2Fapi%2Fhealth'],
    ['well formed but unknown', 'Q'.repeat(43)],
  ]

  it.each(tokens)('answers 404 invite_not_found with a plain message to %s', async (_name, token) => {
    const res = await fetch(`${live.url}/api/invites/${token}`)
    expect(res.status).toBe(404)
    const body = (await res.json()) as { error: { code: string; message: string } }
    expect(body.error.code).toBe('invite_not_found')
    expect(body.error.message).toMatch(/not valid/)
    const accept = await fetch(`${live.url}/api/invites/${token}/accept`, {
      method: 'POST',
      headers: { cookie, 'x-csrf-token': await csrf(), 'content-type': 'application/json' },
      body: '{}',
    })
    expect(accept.status).toBe(404)
  })
})
