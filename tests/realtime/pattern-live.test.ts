/**
 * The room's flat patterns live: seams written in the shared document are cut and laid flat in
 * the solve worker after the surface settles and streamed as a 'pattern' message after the surface
 * (which never waits for the flattening); malformed seams
 * get a named error (the server keeps running); removing the seams clears the pattern.
 */
import type { Socket } from 'socket.io-client'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { parseServerEvent, type PatternEvent } from '../../shared/protocol/index.js'
import { addSeamFamily, patternMap, removeSeamFamily } from '../../shared/room-doc/seams.js'
import { connectDoc, connectStream, makeRoom, signedInUser, startLive, until, type Live } from './live-helpers.js'

let live: Live
let owner: { id: string; cookie: string }
const closers: (() => void)[] = []

beforeAll(async () => {
  live = await startLive()
  owner = await signedInUser(live, 'Cutter')
})

afterAll(async () => {
  for (const close of closers) close()
  await live?.stop()
})

describe('pattern stream', () => {
  it('lays the strips flat after each settle and names bad seams', async () => {
    const roomId = await makeRoom(live.running.dataSource, [{ userId: owner.id, role: 'owner' }])
    await live.realtime.ensureRoomFrame(roomId, 'sail')
    const editor = connectDoc(live.url, roomId, owner.cookie)
    closers.push(() => editor.destroy())
    await editor.synced
    const socket: Socket = connectStream(live.url, owner.cookie)
    closers.push(() => socket.close())
    const patterns: PatternEvent[] = []
    /** Arrival order of fine surfaces, settled states and patterns, by version. */
    const arrivals: string[] = []
    // every message must pass the protocol's own schema (shared/protocol/pattern.ts)
    socket.on('pattern', (raw: unknown) => {
      const pattern = parseServerEvent('pattern', raw)
      patterns.push(pattern)
      arrivals.push(`pattern ${pattern.version}`)
    })
    socket.on('surface', (raw: unknown) => {
      const surface = parseServerEvent('surface', raw)
      if (!surface.coarse) arrivals.push(`surface ${surface.version}`)
    })
    socket.on('solve:state', (raw: unknown) => {
      const state = parseServerEvent('solve:state', raw)
      if (state.state === 'settled') arrivals.push(`settled ${state.version}`)
    })
    await socket.timeout(10_000).emitWithAck('room:join', { roomId })

    const family = addSeamFamily(editor.doc, { kind: 'parallel', angle: 0, spacing: 2, offset: 0.5 })
    await until(() => patterns.some((p) => p.result !== null), 90_000, 'first pattern')
    const first = patterns.find((p) => p.result !== null)!
    expect(first.roomId).toBe(roomId)
    // the surface of that version, and the news that it settled, came before its pattern: the
    // solve answers without waiting for the strips to be laid flat
    const at = (what: string) => arrivals.indexOf(`${what} ${first.version}`)
    expect(at('surface')).toBeGreaterThanOrEqual(0)
    expect(at('surface')).toBeLessThan(at('settled'))
    expect(at('settled')).toBeLessThan(at('pattern'))
    expect(first.result!.strips.length).toBeGreaterThanOrEqual(3)
    expect(first.result!.caution).toMatch(/engineer of record/)
    expect(first.flat.vertexStart).toHaveLength(first.result!.strips.length + 1)
    // binary arrays travel as binary, few attachments (socket.io-parser allows 10)
    expect(first.flat.uv).toBeInstanceOf(Float32Array)
    expect(first.triangleStrip.length).toBe(first.cutTriangles.length / 3)
    for (const s of first.result!.strips) expect(Math.abs(s.areaFlat / s.area3d - 1)).toBeLessThan(0.01)

    const families = patternMap(editor.doc).get('families') as Y.Array<Y.Map<unknown>>
    families.get(0).set('spacing', 'wide')
    await until(() => patterns.some((p) => p.error !== null), 30_000, 'named error')
    expect(patterns.find((p) => p.error)!.error).toMatchObject({
      code: 'invalid-seams',
      field: 'pattern.families[0].spacing',
    })

    families.get(0).set('spacing', 2)
    const before = patterns.length
    removeSeamFamily(editor.doc, family)
    await until(
      () => patterns.slice(before).some((p) => p.result === null && p.error === null),
      30_000,
      'cleared pattern',
    )
  }, 180_000)
})
