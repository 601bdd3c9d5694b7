import { vi } from 'vitest'

/** One request as the client sent it. */
export interface SentRequest {
  method: string
  path: string
  headers: Record<string, string>
  body: unknown
}

type Handler = (req: SentRequest) => { status: number; body?: unknown } | 'network-down'

/**
 * Replaces global fetch with a scripted server so the API module runs unmodified. Handlers are
 * matched by "METHOD /path"; anything unscripted answers 404 in the contract's error shape.
 */
export function fakeServer(routes: Record<string, Handler>) {
  const sent: SentRequest[] = []
  const fetchMock = vi.fn(async (input: string | URL | Request, init?: RequestInit) => {
    const method = (init?.method ?? 'GET').toUpperCase()
    const path = String(input)
    const headers = Object.fromEntries(new Headers(init?.headers).entries())
    const body = typeof init?.body === 'string' ? (JSON.parse(init.body) as unknown) : undefined
    const req = { method, path, headers, body }
    sent.push(req)
    const handler = routes[`${method} ${path}`]
    const reply = handler ? handler(req) : { status: 404, body: { error: { code: 'not_found', message: 'No route' } } }
    if (reply === 'network-down') throw new TypeError('fetch failed')
    const text = reply.body === undefined ? null : JSON.stringify(reply.body)
    return new Response(text, { status: reply.status, headers: text ? { 'content-type': 'application/json' } : {} })
  })
  vi.stubGlobal('fetch', fetchMock)
  return { sent, fetchMock }
}

/** A CSRF endpoint that hands out t1, t2, … so tests can see when a fresh token was fetched. */
export function csrfIssuer(): Handler {
  let n = 0
  return () => ({ status: 200, body: { token: `t${++n}` } })
}
