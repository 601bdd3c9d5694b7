/**
 * A y-websocket peer spoken by hand (lib0 + y-protocols), so a test can send exactly one message
 * type, or bytes that are not a message at all, and see what the server does with them.
 */
import * as decoding from 'lib0/decoding'
import * as encoding from 'lib0/encoding'
import * as awarenessProtocol from 'y-protocols/awareness'
import * as syncProtocol from 'y-protocols/sync'
import WebSocket from 'ws'
import * as Y from 'yjs'
import { until } from '../realtime/live-helpers.js'

export const MESSAGE_SYNC = 0
export const MESSAGE_AWARENESS = 1

export interface RawPeer {
  ws: WebSocket
  /** Mirrors what the server sent (its sync step 2 and relayed updates). */
  doc: Y.Doc
  /** Sync sub-types the server sent, in order (0 step 1, 1 step 2, 2 update). */
  syncSeen: number[]
  closed: Promise<{ code: number }>
  send: (bytes: Uint8Array) => void
}

/** Resolves with the HTTP status of a refused upgrade, or 101 and the open peer. */
export function openRaw(
  url: string,
  roomId: string,
  headers: Record<string, string>,
  options: { maxPayload?: number } = {},
): Promise<{ status: number; peer?: RawPeer }> {
  return new Promise((resolve) => {
    const ws = new WebSocket(url.replace(/^http/, 'ws') + `/sync/${roomId}`, {
      headers,
      maxPayload: options.maxPayload,
    })
    const doc = new Y.Doc()
    const syncSeen: number[] = []
    const closed = new Promise<{ code: number }>((r) => ws.on('close', (code) => r({ code })))
    ws.on('error', () => undefined)
    ws.on('unexpected-response', (_req, res) => resolve({ status: res.statusCode ?? 0 }))
    ws.on('message', (data: Buffer) => {
      const decoder = decoding.createDecoder(new Uint8Array(data))
      if (decoding.readVarUint(decoder) !== MESSAGE_SYNC) return
      const step = decoding.readVarUint(decoder)
      syncSeen.push(step)
      if (step !== syncProtocol.messageYjsSyncStep1) Y.applyUpdate(doc, decoding.readVarUint8Array(decoder), 'server')
    })
    ws.on('open', () => resolve({ status: 101, peer: { ws, doc, syncSeen, closed, send: (bytes) => ws.send(bytes) } }))
  })
}

/** A sync message: step 1 carries a state vector, step 2 and update carry a V1 update. */
export function syncMessage(step: number, payload: Uint8Array): Uint8Array {
  const encoder = encoding.createEncoder()
  encoding.writeVarUint(encoder, MESSAGE_SYNC)
  encoding.writeVarUint(encoder, step)
  encoding.writeVarUint8Array(encoder, payload)
  return encoding.toUint8Array(encoder)
}

/** An awareness message announcing `state` for a fresh client id; returns the id too. */
export function awarenessMessage(state: Record<string, unknown>): { bytes: Uint8Array; clientId: number } {
  const doc = new Y.Doc()
  const awareness = new awarenessProtocol.Awareness(doc)
  awareness.setLocalState(state)
  const encoder = encoding.createEncoder()
  encoding.writeVarUint(encoder, MESSAGE_AWARENESS)
  encoding.writeVarUint8Array(encoder, awarenessProtocol.encodeAwarenessUpdate(awareness, [doc.clientID]))
  const out = { bytes: encoding.toUint8Array(encoder), clientId: doc.clientID }
  awareness.destroy()
  doc.destroy()
  return out
}

/** The V1 update that an edit of `peer.doc` produces (the edit is applied locally too). */
export function editUpdate(doc: Y.Doc, edit: (doc: Y.Doc) => void): Uint8Array {
  let captured: Uint8Array | null = null
  const grab = (u: Uint8Array, origin: unknown) => {
    if (origin !== 'server') captured = u
  }
  doc.on('update', grab)
  edit(doc)
  doc.off('update', grab)
  if (!captured) throw new Error('the edit changed nothing')
  return captured
}

/**
 * A sync step 1 and its answer: the server answers after the updates it received before are stored
 * and applied (server/realtime/sync-endpoint.ts), so once this returns they have been dealt with.
 * Resolves 'closed' when the server closed the socket instead.
 */
export async function roundTrip(peer: RawPeer, ms = 10_000): Promise<'answered' | 'closed'> {
  const answers = () => peer.syncSeen.filter((step) => step === syncProtocol.messageYjsSyncStep2).length
  const before = answers()
  let closed = false
  void peer.closed.then(() => (closed = true))
  if (peer.ws.readyState === WebSocket.OPEN) peer.send(syncMessage(0, Y.encodeStateVector(peer.doc)))
  await until(() => closed || peer.ws.readyState !== WebSocket.OPEN || answers() > before, ms, 'sync round trip')
  return answers() > before ? 'answered' : 'closed'
}
