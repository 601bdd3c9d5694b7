/**
 * The room's live document (yjs) over the /sync WebSocket (docs: notes/protocol.md "CRDT sync"),
 * with presence (awareness) and an undo manager that only ever undoes this browser's own edits.
 * Read-only roles still sync and show presence; the server drops their updates anyway, and the
 * workbench refuses to make them in the first place.
 */
import * as Y from 'yjs'
import { WebsocketProvider } from 'y-websocket'
import type { Awareness } from 'y-protocols/awareness'
import { frameMap } from '../../shared/room-doc/schema'
import { patternMap } from '../../shared/room-doc/seams'
import type { RoomRole } from './schemas'
import { can } from '../../shared/protocol'

export interface PresenceUser {
  id: string
  name: string
  /** CSS colour of this person's cursor ring and badge. */
  color: string
}

/** The frame point someone is dragging or has selected. */
export interface HeldPoint {
  loopId: string
  pointId: string
}

/** Awareness state per client, as agreed in the protocol. */
export interface PresenceState {
  user: PresenceUser
  held: HeldPoint | null
}

export type SyncStatus = 'connecting' | 'connected' | 'disconnected'

// Our own set: distinct on the pale page and against the surface ramps.
export const PRESENCE_COLOURS = ['#c2571a', '#3f6fb5', '#8a4fa3', '#2e8b57', '#b03a63', '#a07a12', '#1f8a99', '#6b5b3e']

/** A stable colour for a user id, so a person keeps their colour across sessions. */
export function presenceColour(userId: string): string {
  let h = 0
  for (const ch of userId) h = (h * 31 + ch.charCodeAt(0)) >>> 0
  return PRESENCE_COLOURS[h % PRESENCE_COLOURS.length]!
}

// Read through globalThis so this module also type-checks in the Node test config (no DOM lib).
const pageLocation = (): { protocol: string; host: string } =>
  (globalThis as unknown as { location: { protocol: string; host: string } }).location

/** ws(s)://host of the page, where the server answers /sync. */
export function syncBase(loc: { protocol: string; host: string } = pageLocation()): string {
  return `${loc.protocol === 'https:' ? 'wss:' : 'ws:'}//${loc.host}`
}

/** Edits closer together than this (ms) undo as one step, e.g. typing then tabbing on. */
export const CAPTURE_TIMEOUT_MS = 400

/**
 * An undo manager over the frame and the seams that tracks only transactions made with `origin`, so undo never
 * reverts a peer's edit. Edits in shared/room-doc/edits.ts take the origin as their last argument.
 */
export function createUndoManager(doc: Y.Doc, origin: object): Y.UndoManager {
  return new Y.UndoManager([frameMap(doc), patternMap(doc)], {
    trackedOrigins: new Set([origin]),
    captureTimeout: CAPTURE_TIMEOUT_MS,
  })
}

export interface Collaboration {
  doc: Y.Doc
  provider: WebsocketProvider
  /** Pass to every edit so undo knows it is ours. */
  origin: object
  undo: Y.UndoManager
  readOnly: boolean
  /** Sets (or clears) the point this person holds, for peers' rings. */
  hold(held: HeldPoint | null): void
  destroy(): void
}

/** Opens a room's document: sync, presence with the given user, undo of own edits. */
export function openRoomDocument(roomId: string, user: PresenceUser, role: RoomRole): Collaboration {
  const doc = new Y.Doc()
  // No cross-tab BroadcastChannel: every change goes through the server, which enforces roles.
  const provider = new WebsocketProvider(`${syncBase()}/sync`, roomId, doc, { disableBc: true })
  const origin = { source: 'workbench', roomId }
  const undo = createUndoManager(doc, origin)
  // y-websocket re-sends every awareness change it hears, peers' states included; the server lets
  // a socket speak only for its own client id (and it saves traffic), so send our own state only.
  const forward = provider._awarenessUpdateHandler
  const ownOnly = (change: AwarenessChange, origin: unknown): void => {
    const own = ownAwarenessChange(doc.clientID, change)
    if (own) forward(own, origin)
  }
  provider.awareness.off('update', forward)
  provider.awareness.on('update', ownOnly)
  const state: PresenceState = { user, held: null }
  provider.awareness.setLocalState(state)
  return {
    doc,
    provider,
    origin,
    undo,
    readOnly: !can(role, 'editFrame'),
    hold(held) {
      provider.awareness.setLocalStateField('held', held)
    },
    destroy() {
      provider.awareness.setLocalState(null)
      provider.awareness.off('update', ownOnly)
      undo.destroy()
      provider.destroy()
      doc.destroy()
    },
  }
}

/** The client ids an awareness 'update' event names. */
export interface AwarenessChange {
  added: number[]
  updated: number[]
  removed: number[]
}

/** The part of an awareness change about `clientId` alone, or null when it names only others. */
export function ownAwarenessChange(clientId: number, change: AwarenessChange): AwarenessChange | null {
  const mine = (ids: number[]): number[] => ids.filter((id) => id === clientId)
  const own = { added: mine(change.added), updated: mine(change.updated), removed: mine(change.removed) }
  return own.added.length + own.updated.length + own.removed.length > 0 ? own : null
}

/** Reads a peer's awareness state; anything malformed (an old or foreign client) gives null. */
export function readPresence(state: unknown): PresenceState | null {
  if (typeof state !== 'object' || state === null) return null
  const { user, held } = state as { user?: unknown; held?: unknown }
  if (typeof user !== 'object' || user === null) return null
  const u = user as Record<string, unknown>
  if (typeof u.id !== 'string' || typeof u.name !== 'string' || typeof u.color !== 'string') return null
  // The colour goes into styles and materials: accept plain #rrggbb only.
  if (!/^#[0-9a-f]{6}$/i.test(u.color)) return null
  let h: HeldPoint | null = null
  if (typeof held === 'object' && held !== null) {
    const { loopId, pointId } = held as Record<string, unknown>
    if (typeof loopId === 'string' && typeof pointId === 'string') h = { loopId, pointId }
  }
  return { user: { id: u.id, name: u.name, color: u.color }, held: h }
}

/** This client's clock in the document: a surface includes our edits once its state vector reaches it. */
export function ownClock(doc: Y.Doc): number {
  return Y.getState(doc.store, doc.clientID)
}

/** Whether a surface's state vector (Y.encodeStateVector) includes `clientId`'s edits up to `clock`. */
export function includesClock(stateVector: Uint8Array, clientId: number, clock: number): boolean {
  if (clock === 0) return true
  try {
    return (Y.decodeStateVector(stateVector).get(clientId) ?? 0) >= clock
  } catch {
    return false
  }
}

export interface Peer extends PresenceUser {
  /** Awareness client id: one person may be here in two tabs. */
  clientId: number
  held: HeldPoint | null
}

/** Lists peers' presence (not this client's), sorted by name. */
export function listPeers(awareness: Awareness): Peer[] {
  const peers: Peer[] = []
  awareness.getStates().forEach((state, clientId) => {
    if (clientId === awareness.clientID) return
    const p = readPresence(state)
    if (p) peers.push({ ...p.user, clientId, held: p.held })
  })
  return peers.sort((a, b) => a.name.localeCompare(b.name) || a.clientId - b.clientId)
}

/** Calls `onPeers` now and whenever presence changes; returns the unsubscribe function. */
export function trackPeers(awareness: Awareness, onPeers: (peers: Peer[]) => void): () => void {
  const listener = (): void => onPeers(listPeers(awareness))
  awareness.on('change', listener)
  listener()
  return () => awareness.off('change', listener)
}
