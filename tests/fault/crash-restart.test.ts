/**
 * kill -9 of the server while editors are connected. The promise being tested is the protocol's
 * (server/realtime/README.md, room-docs.ts): every update is stored in MariaDB before it is relayed to peers, so
 * anything a peer has seen survives a hard crash. After the restart the clients reconnect by
 * themselves (y-websocket backs off and retries), converge, and no frame point is duplicated.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { DataSource } from 'typeorm'
import * as Y from 'yjs'
import { loadConfig } from '../../server/config.js'
import { createDataSource } from '../../server/db/data-source.js'
import { insertPointAfter, movePoint } from '../../shared/room-doc/edits.js'
import { loopsOf, readRawFrame } from '../../shared/room-doc/schema.js'
import { connectDoc, makeRoom, makeUser, signIn, until, type DocClient } from '../realtime/live-helpers.js'
import { killHard, startChild, testEnv, type Child } from './child-server.js'

let ds: DataSource
let server: Child
const clients: DocClient[] = []

beforeAll(async () => {
  ds = await createDataSource(loadConfig(testEnv())).initialize()
})
afterAll(async () => {
  for (const c of clients) c.destroy()
  if (server) await killHard(server)
  await ds?.destroy()
})

const frameJson = (doc: Y.Doc) => JSON.stringify(readRawFrame(doc))
const outerId = (doc: Y.Doc) => loopsOf(doc).get(0).get('id') as string
const pointIds = (doc: Y.Doc) =>
  (readRawFrame(doc) as { loops: { points: { id: string }[] }[] }).loops.flatMap((l) => l.points.map((p) => p.id))

describe('kill -9 and restart', () => {
  it('keeps every relayed edit, reconnects the clients and converges without duplicates', async () => {
    const a = await makeUser(ds, 'Crasher')
    const b = await makeUser(ds, 'Witness')
    const roomId = await makeRoom(ds, [
      { userId: a.id, role: 'owner' },
      { userId: b.id, role: 'editor' },
    ])
    server = await startChild(testEnv())
    const cookieA = await signIn(server.url, a.email)
    const cookieB = await signIn(server.url, b.email)
    const docA = connectDoc(server.url, roomId, cookieA)
    const docB = connectDoc(server.url, roomId, cookieB)
    clients.push(docA, docB)
    await Promise.all([docA.synced, docB.synced])

    // Edits from both sides; each counts as "seen" once the other side has it.
    let after = 'b2'
    for (let i = 0; i < 12; i++) {
      const writer = i % 2 ? docB : docA
      if (i % 3 === 0)
        after = insertPointAfter(writer.doc, outerId(writer.doc), after, {
          x: 3 + i * 0.01,
          y: -0.5 - i * 0.1,
          z: 0.1 * i,
        })!
      else movePoint(writer.doc, outerId(writer.doc), 'b1', { z: 0.05 * i })
      await until(() => frameJson(docA.doc) === frameJson(docB.doc), 5000, `edit ${i} relayed`)
    }
    const seen = frameJson(docB.doc)
    const ids = pointIds(docB.doc)

    await killHard(server)
    server = await startChild(testEnv(), server.port)

    // A newcomer gets exactly what the peers had seen before the crash.
    const cookieC = await signIn(server.url, a.email)
    const docC = connectDoc(server.url, roomId, cookieC)
    clients.push(docC)
    await docC.synced
    expect(frameJson(docC.doc)).toBe(seen)
    expect(new Set(pointIds(docC.doc)).size).toBe(ids.length)

    // The old clients reconnect on their own (same port) and everyone converges after more edits.
    await until(() => docA.provider.wsconnected && docB.provider.wsconnected, 20_000, 'old clients reconnected')
    movePoint(docA.doc, outerId(docA.doc), 'b3', { z: 1.5 })
    movePoint(docC.doc, outerId(docC.doc), 'b4', { z: -0.5 })
    await until(
      () =>
        frameJson(docA.doc) === frameJson(docB.doc) &&
        frameJson(docB.doc) === frameJson(docC.doc) &&
        frameJson(docC.doc).includes('1.5'),
      10_000,
      'convergence after restart',
    )
    expect(pointIds(docA.doc).sort()).toEqual(ids.sort())
  }, 120_000)
})
