import { mkdtempSync, writeFileSync } from 'node:fs'
import { createServer, type Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createApp, type AppBundle } from '../../server/app.js'
import { createDataSource } from '../../server/db/data-source.js'
import type { Running } from '../../server/main.js'
import { startTestServer } from '../helpers/test-server.js'

let server: Running
beforeAll(async () => {
  server = await startTestServer()
})
afterAll(async () => {
  await server?.stop()
})

/** Listens with an app built by createApp on port 0; returns its URL and a closer. */
async function listen(bundle: AppBundle): Promise<{ url: string; close: () => Promise<void> }> {
  const http: Server = createServer(bundle.app)
  await new Promise<void>((r) => http.listen(0, '127.0.0.1', r))
  const url = `http://127.0.0.1:${(http.address() as AddressInfo).port}`
  return {
    url,
    close: async () => {
      http.closeAllConnections()
      await new Promise((r) => http.close(r))
      await bundle.close()
    },
  }
}

describe('serving the built client', () => {
  it('serves dist/ with a fallback to index.html for client routes, but not for /api', async () => {
    const dist = mkdtempSync(join(tmpdir(), 'veilroom-dist-'))
    writeFileSync(join(dist, 'index.html'), '<!doctype html><title>Veilroom test shell</title>')
    writeFileSync(join(dist, 'app.js'), 'console.log(1)')
    const app = await listen(createApp({ config: server.config, dataSource: server.dataSource, distDir: dist }))
    try {
      const deep = await fetch(app.url + '/rooms/some-room')
      expect(deep.status).toBe(200)
      expect(await deep.text()).toContain('Veilroom test shell')
      expect((await fetch(app.url + '/app.js')).headers.get('content-type')).toMatch(/javascript/)
      const api = await fetch(app.url + '/api/unknown')
      expect(api.status).toBe(404)
      expect(await api.json()).toMatchObject({ error: { code: 'not_found' } })
    } finally {
      await app.close()
    }
  })

  it('sends a CSP that allows our scripts, websockets, blob: workers and data: images only', async () => {
    const csp = (await fetch(server.url + '/api/health')).headers.get('content-security-policy') ?? ''
    expect(csp).toMatch(/script-src 'self'(;|$)/)
    expect(csp).toMatch(/connect-src 'self' ws: wss:/)
    expect(csp).toMatch(/worker-src 'self' blob:/)
    expect(csp).toMatch(/img-src 'self' data: blob:/)
    expect(csp).toMatch(/object-src 'none'/)
  })
})

describe('health', () => {
  it('answers 503 { ok: false, db: "down" } when the database cannot be reached', async () => {
    const dataSource = createDataSource(server.config)
    await dataSource.initialize()
    const app = await listen(createApp({ config: server.config, dataSource }))
    try {
      expect((await fetch(app.url + '/api/health')).status).toBe(200)
      await dataSource.destroy()
      const down = await fetch(app.url + '/api/health')
      expect(down.status).toBe(503)
      expect(await down.json()).toMatchObject({ ok: false, db: 'down', redis: 'off' })
    } finally {
      await app.close()
    }
  })
})
