/**
 * MariaDB stops while editors are connected, then comes back. Expected (the API contract in DEVELOPERS.md
 * and server/realtime/README.md): /api/health answers 503 while the database is down; a write is refused with an
 * error in the JSON error shape, or kept for later; the server process survives; once MariaDB is
 * back the app serves again without a restart, and the edits made during the outage end up stored.
 * Runs on a private MariaDB instance so other test runs sharing the test instance are not disturbed.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { loadConfig } from '../../server/config.js'
import { createDataSource } from '../../server/db/data-source.js'
import { loadStoredRoom } from '../../server/realtime/room-store.js'
import { movePoint } from '../../shared/room-doc/edits.js'
import { loopsOf, readRawFrame } from '../../shared/room-doc/schema.js'
import { connectDoc, makeRoom, makeUser, signIn, until, type DocClient } from '../realtime/live-helpers.js'
import { killHard, privateDb, startChild, type Child, type PrivateDb } from './child-server.js'

let db: PrivateDb
let server: Child
const clients: DocClient[] = []

beforeAll(async () => {
  db = await privateDb()
}, 60_000)
afterAll(async () => {
  for (const c of clients) c.destroy()
  if (server) await killHard(server)
  await db?.destroy()
}, 60_000)

const frameJson = (doc: Y.Doc) => JSON.stringify(readRawFrame(doc))
const outerId = (doc: Y.Doc) => loopsOf(doc).get(0).get('id') as string

async function post(url: string, path: string, cookie: string, body: unknown) {
  const csrf = await fetch(`${url}/api/auth/csrf`, { headers: { cookie } })
  const token = csrf.ok ? ((await csrf.json()) as { token: string }).token : ''
  const res = await fetch(url + path, {
    method: 'POST',
    headers: { cookie, 'x-csrf-token': token, 'content-type': 'application/json' },
    body: JSON.stringify(body),
  })
  const text = await res.text()
  return { status: res.status, body: text ? JSON.parse(text) : null }
}

describe('MariaDB restart under live clients', () => {
  it('reports 503, refuses writes clearly, survives, and recovers with the outage edits stored', async () => {
    const ds = await createDataSource(loadConfig(db.env)).initialize()
    const a = await makeUser(ds, 'Ada')
    const b = await makeUser(ds, 'Bo')
    const roomId = await makeRoom(ds, [
      { userId: a.id, role: 'owner' },
      { userId: b.id, role: 'editor' },
    ])
    await ds.destroy()
    server = await startChild(db.env)
    const cookieA = await signIn(server.url, a.email)
    const docA = connectDoc(server.url, roomId, cookieA)
    const docB = connectDoc(server.url, roomId, await signIn(server.url, b.email))
    clients.push(docA, docB)
    await Promise.all([docA.synced, docB.synced])
    movePoint(docA.doc, outerId(docA.doc), 'b1', { z: 0.25 })
    await until(() => frameJson(docB.doc).includes('0.25'), 5000, 'edit before the outage')

    await db.stop()
    const health = await fetch(`${server.url}/api/health`)
    expect(health.status).toBe(503)
    expect(await health.json()).toMatchObject({ ok: false, db: 'down', redis: 'off' })
    const refused = await post(server.url, '/api/rooms', cookieA, { name: 'during the outage' })
    console.log('write during the outage:', refused.status, JSON.stringify(refused.body))
    expect(refused.status).toBeGreaterThanOrEqual(500)
    expect(refused.body.error.code).toBe('db_unavailable')
    // A live edit during the outage: room-docs relays it anyway (peers stay in step) and keeps it in
    // memory until a later compaction can store it; a crash before then leaves it only in the clients.
    movePoint(docA.doc, outerId(docA.doc), 'b2', { z: 0.75 })
    await until(() => frameJson(docB.doc).includes('0.75'), 5000, 'edit during the outage reaches the peer')
    expect(server.child.exitCode).toBeNull()

    await db.start()
    const back = Date.now()
    const healthy = async () => (await fetch(`${server.url}/api/health`)).status === 200
    await until(healthy, 20_000, 'health 200 after MariaDB is back', 100)
    console.log(`healthy again ${Date.now() - back} ms after MariaDB answered`)
    const created = await post(server.url, '/api/rooms', cookieA, { name: 'after the outage' })
    expect(created.status).toBe(201)

    // Leaving the room stores its full state: the outage edit is in the database after all.
    docA.destroy()
    docB.destroy()
    clients.length = 0
    const check = await createDataSource(loadConfig(db.env)).initialize()
    try {
      let stored = ''
      const storedFrame = async () => {
        const room = await loadStoredRoom(check, roomId)
        const doc = new Y.Doc()
        if (room.state) Y.applyUpdate(doc, room.state)
        for (const u of room.updates) Y.applyUpdate(doc, u)
        stored = frameJson(doc)
        return stored.includes('0.75')
      }
      await until(storedFrame, 10_000, 'the outage edit stored', 100)
      expect(stored).toContain('0.25')
      expect(stored).toContain('0.75')
    } finally {
      await check.destroy()
    }
  }, 120_000)
})
