import { describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { Awareness } from 'y-protocols/awareness'
import { float32Schema, parseServerEvent, reasonWords, solverReasons, uint32Schema } from '../../shared/protocol'
import {
  PRESENCE_COLOURS,
  listPeers,
  ownAwarenessChange,
  presenceColour,
  readPresence,
  syncBase,
} from '../../src/api/collaboration'

const figures = {
  area: 70.2,
  planArea: 64,
  perimeter: 32.5,
  cables: [{ loop: 0, edge: 1, length: 8.1, force: 24, sag: 0.4 }],
  heightRange: [0.5, 3.2],
  slopeRange: [2, 41],
  slopeHistogram: { edges: [0, 10, 20], shares: [0.3, 0.7] },
  flatThreshold: 5,
  flatShare: 0.02,
  pondingPockets: [],
  anticlasticShare: 0.97,
  reactions: [[0, 0, 1, 2, 3]],
  residual: 1e-9,
  minAngle: 28,
}
const solver = { method: 'newton-height-field', iterations: 4, residual: 1e-9, converged: true, ms: 12 }

function message(overrides: Record<string, unknown> = {}) {
  const vertices = new Float32Array([0, 0, 0, 1, 0, 0, 0, 1, 0.5])
  const triangles = new Uint32Array([0, 1, 2])
  // the way socket.io hands binary to a Node client: Buffers (here sharing one pooled ArrayBuffer)
  return {
    roomId: 'r1',
    version: 3,
    stateVector: Buffer.from([1, 5, 2]),
    coarse: false,
    vertices: Buffer.from(vertices.buffer),
    triangles: triangles.buffer,
    figures,
    solver,
    ...overrides,
  }
}

const readSurface = (raw: unknown) => parseServerEvent('surface', raw)
const readSolveState = (raw: unknown) => parseServerEvent('solve:state', raw)
const readSolveProgress = (raw: unknown) => parseServerEvent('solve:progress', raw)

describe('surface stream messages (shared/protocol/events.ts)', () => {
  it('wraps binary fields back into typed arrays with the same values', () => {
    const s = readSurface(message())
    expect(s.vertices).toBeInstanceOf(Float32Array)
    expect(Array.from(s.vertices)).toEqual([0, 0, 0, 1, 0, 0, 0, 1, 0.5])
    expect(s.triangles).toBeInstanceOf(Uint32Array)
    expect(Array.from(s.triangles)).toEqual([0, 1, 2])
    expect(Array.from(s.stateVector)).toEqual([1, 5, 2])
    expect(s.figures.area).toBe(70.2)
  })

  it('copies a view that starts at an unaligned byte offset', () => {
    const bytes = new Uint8Array(13)
    new DataView(bytes.buffer).setFloat32(1, 2.5, true)
    new DataView(bytes.buffer).setFloat32(5, -1, true)
    new DataView(bytes.buffer).setFloat32(9, 7, true)
    expect(Array.from(float32Schema.parse(bytes.subarray(1)))).toEqual([2.5, -1, 7])
  })

  it('names the field and the reason for malformed data', () => {
    expect(() => readSurface(message({ triangles: new ArrayBuffer(6) }))).toThrow(
      'surface.triangles: 6 bytes is not a whole number of 4-byte values',
    )
    expect(uint32Schema.safeParse(new ArrayBuffer(8)).success).toBe(true)
    expect(() => readSurface(message({ vertices: 'abc' }))).toThrow(
      'surface.vertices: expected binary data, got string',
    )
    expect(() => readSurface(message({ triangles: new Uint32Array([0, 1, 9]).buffer }))).toThrow(
      'surface.triangles: vertex index 9 is out of range (3 vertices)',
    )
    expect(() => readSurface(message({ figures: { ...figures, area: 'big' } }))).toThrow(/^surface\.figures\.area: /)
    expect(() => readSurface(message({ solver: { ...solver, converged: undefined } }))).toThrow(
      /^surface\.solver\.converged: /,
    )
  })

  it('reads solver states and progress, refusing unknown states', () => {
    expect(
      readSolveState({
        roomId: 'r1',
        version: 4,
        state: 'unsettled',
        reason: 'invalid-frame',
        message: 'Loop crosses itself',
        field: 'loops[0]',
      }),
    ).toEqual({
      roomId: 'r1',
      version: 4,
      state: 'unsettled',
      reason: 'invalid-frame',
      message: 'Loop crosses itself',
      field: 'loops[0]',
    })
    expect(() => readSolveState({ roomId: 'r1', version: 4, state: 'done' })).toThrow(/^solve:state\.state: /)
    expect(readSolveProgress({ roomId: 'r1', version: 4, iteration: 3, residual: 0.01 })).toEqual({
      roomId: 'r1',
      version: 4,
      iteration: 3,
      residual: 0.01,
    })
    expect(() => readSolveProgress({ roomId: 'r1', version: 4, iteration: '3', residual: 1 })).toThrow(
      /^solve:progress\.iteration: /,
    )
  })

  it('turns a reason code this version does not know into words, never the code', () => {
    expect(readSolveState({ roomId: 'r1', version: 4, state: 'unsettled', reason: 'zeta-overflow' }).reason).toBe(
      'unknown',
    )
    for (const code of [...solverReasons, 'stalled', 'line-search-failed', 'zeta-overflow', undefined]) {
      const words = reasonWords(code)
      expect(words).toMatch(/^[a-z][a-z ,()]+$/)
      if (code) expect(words).not.toContain(code)
    }
  })
})

describe('presence', () => {
  it('lists other clients, not myself, and ignores malformed states', () => {
    const mine = new Awareness(new Y.Doc())
    const peerDoc = new Y.Doc()
    const peer = new Awareness(peerDoc)
    peer.setLocalState({ user: { id: 'u2', name: 'Ines', color: '#3f6fb5' }, held: { loopId: 'l1', pointId: 'p3' } })
    mine.setLocalState({ user: { id: 'u1', name: 'Aru', color: '#c2571a' }, held: null })
    // copy the peer's state in, as the provider would from an awareness update
    mine.states.set(peer.clientID, peer.getLocalState()!)
    mine.states.set(999, { user: { id: 'x', name: 'Mallory', color: 'red; background:url(x)' }, held: null })
    const peers = listPeers(mine)
    expect(peers).toEqual([
      { id: 'u2', name: 'Ines', color: '#3f6fb5', clientId: peer.clientID, held: { loopId: 'l1', pointId: 'p3' } },
    ])
    expect(readPresence({ user: { id: 'u', name: 'n', color: '#aabbcc' }, held: { loopId: 3 } })?.held).toBeNull()
  })

  it('gives people colours from the palette, spread over it rather than all alike', () => {
    const ids = Array.from({ length: 40 }, (_, i) => `user-${i}`)
    const colours = ids.map(presenceColour)
    for (const c of colours) expect(PRESENCE_COLOURS).toContain(c)
    // 40 ids over the palette: a hash that ignored the id (or most of it) would use one or two colours
    expect(new Set(colours).size).toBeGreaterThanOrEqual(Math.ceil(PRESENCE_COLOURS.length / 2))
    // the id decides, not the call: a copy of the same id built another way gets the same colour
    expect(presenceColour(['user', '7'].join('-'))).toBe(colours[7])
  })

  it('builds the sync URL from the page location', () => {
    expect(syncBase({ protocol: 'https:', host: 'veil.example:8443' })).toBe('wss://veil.example:8443')
    expect(syncBase({ protocol: 'http:', host: 'localhost:5173' })).toBe('ws://localhost:5173')
  })
})

describe('awareness sent to the server', () => {
  it('keeps only this client in an awareness change (peers speak for themselves)', () => {
    expect(ownAwarenessChange(7, { added: [7, 9], updated: [], removed: [3] })).toEqual({
      added: [7],
      updated: [],
      removed: [],
    })
    expect(ownAwarenessChange(7, { added: [], updated: [9], removed: [3] })).toBeNull()
    expect(ownAwarenessChange(7, { added: [], updated: [], removed: [7] })).toEqual({
      added: [],
      updated: [],
      removed: [7],
    })
  })
})
