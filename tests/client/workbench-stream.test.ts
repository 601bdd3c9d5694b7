import { describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { Awareness } from 'y-protocols/awareness'
import { asFloat32, asUint32, readSolveProgress, readSolveState, readSurface } from '../../src/api/socket'
import { listPeers, ownAwarenessChange, presenceColour, readPresence, syncBase } from '../../src/api/collaboration'

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

describe('surface stream messages', () => {
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
    expect(Array.from(asFloat32(bytes.subarray(1), 'vertices'))).toEqual([2.5, -1, 7])
  })

  it('names the field and the reason for malformed data', () => {
    expect(() => asUint32(new ArrayBuffer(6), 'triangles')).toThrow(
      'surface.triangles: 6 bytes is not a whole number of 4-byte values',
    )
    expect(() => asFloat32('abc', 'vertices')).toThrow('surface.vertices: expected binary data')
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
    expect(() => readSolveState({ roomId: 'r1', state: 'done' })).toThrow('solve:state.state: unknown state done')
    expect(readSolveProgress({ roomId: 'r1', version: 4, iteration: 3, residual: 0.01 })).toEqual({
      roomId: 'r1',
      version: 4,
      iteration: 3,
      residual: 0.01,
    })
    expect(() => readSolveProgress({ roomId: 'r1', iteration: '3' })).toThrow(/iteration and residual/)
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

  it('gives a person the same colour every time, in #rrggbb form', () => {
    expect(presenceColour('42')).toBe(presenceColour('42'))
    expect(presenceColour('42')).toMatch(/^#[0-9a-f]{6}$/)
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
