import { computed, ref, shallowRef } from 'vue'
import { defineStore } from 'pinia'
import * as edits from '../../shared/room-doc/edits'
import { writeFrame } from '../../shared/room-doc/schema'
import type { EdgeKind, Frame } from '../../shared/types'
import {
  CAPTURE_TIMEOUT_MS,
  includesClock,
  openRoomDocument,
  ownClock,
  trackPeers,
  type Collaboration,
  type HeldPoint,
  type Peer,
  type PresenceUser,
  type SyncStatus,
} from '../api/collaboration'
import type { Socket } from 'socket.io-client'
import { connectSurfaceStream, type SurfaceStream } from '../api/socket'
import { readRoomCuts, type RoomCutsRead } from '../../shared/room-doc/seams'
import type * as Y from 'yjs'
import { can, type PatternEvent, type RoomRole, type SolveStateEvent, type SurfaceEvent } from '../../shared/protocol'
import { getUnderlayMeta, roomPath, type UnderlayMeta } from '../api/team'
import type { ColourMode } from '../lib/colour-maps'
import { frameRows, readFrameView, type FrameView } from '../lib/frame-view'
import { DEFAULT_SNAP_STEP } from '../lib/snapping'

/** Solver status as shown: offline until the stream is up, then the server's solver states. */
export interface SolverStatus {
  phase: 'offline' | 'waiting' | 'settling' | 'settled' | 'unsettled'
  version: number
  iteration?: number
  residual?: number
  /** A solver reason code (words: reasonWords in shared/protocol/solver-reasons.ts). */
  reason?: string
  message?: string
  field?: string
}

const emptyFrame = (): FrameView => ({
  loops: [],
  prestress: { warp: Number.NaN, fill: Number.NaN, warpAngle: Number.NaN },
  edgeLength: Number.NaN,
  problem: null,
})

export const useWorkbenchStore = defineStore('workbench', () => {
  const roomId = ref<string | null>(null)
  const role = ref<RoomRole>('viewer')
  const readOnly = computed(() => !can(role.value, 'editFrame'))
  const frame = shallowRef<FrameView>(emptyFrame())
  const rows = computed(() => frameRows(frame.value))
  const selection = ref<HeldPoint | null>(null)
  /** The latest solved surface as streamed (typed arrays, figures, solver report). */
  const surface = shallowRef<SurfaceEvent | null>(null)
  /** The room's flat patterns (last 'pattern' message) and its seams as read from the document. */
  const pattern = shallowRef<PatternEvent | null>(null)
  const cuts = shallowRef<RoomCutsRead>(null)
  const figures = computed(() => surface.value?.figures ?? null)
  const status = ref<SolverStatus>({ phase: 'offline', version: 0 })
  const sync = ref<SyncStatus>('connecting')
  const synced = ref(false)
  const streamError = ref<string | null>(null)
  const colourMode = ref<ColourMode>('height')
  const viewMode = ref<'plan' | '3d'>('3d')
  const snapOn = ref(true)
  const snapStep = ref(DEFAULT_SNAP_STEP)
  const peers = ref<Peer[]>([])
  /** The room's site plan (null: none), shown under the frame; visibility and opacity are local. */
  const underlay = shallowRef<UnderlayMeta | null>(null)
  const underlayVisible = ref(true)
  const underlayOpacity = ref(0.6)
  let underlayStamp = 0
  const underlayUrl = ref<string | null>(null)
  const canUndo = ref(false)
  const canRedo = ref(false)
  /** Our clock after our latest edit; the surface is current for us once it includes it. */
  const lastOwnClock = ref(0)
  const clientId = ref(0)
  const surfaceIncludesMine = computed(() =>
    surface.value ? includesClock(surface.value.stateVector, clientId.value, lastOwnClock.value) : false,
  )

  /** The surface stream's socket, for other live features (pins) to listen on one connection. */
  const socket = shallowRef<Socket | null>(null)
  let collab: Collaboration | null = null
  let stream: SurfaceStream | null = null
  let cleanups: (() => void)[] = []

  function onSurface(msg: SurfaceEvent): void {
    if (msg.roomId !== roomId.value) return
    const { version, coarse, solver } = msg
    surface.value = msg
    if (!coarse && version >= status.value.version)
      status.value = {
        phase: solver.converged ? 'settled' : 'unsettled',
        version,
        reason: solver.reason,
        residual: solver.residual,
        iteration: solver.iterations,
      }
  }

  function onSolveState(msg: SolveStateEvent): void {
    if (msg.roomId !== roomId.value || msg.version < status.value.version) return
    const { state, version, reason, message, field } = msg
    status.value = { phase: state, version, reason, message, field }
  }

  /** Opens a room: its live document, presence as `user`, and the surface stream. */
  function open(id: string, user: PresenceUser, myRole: RoomRole): void {
    close()
    roomId.value = id
    role.value = myRole
    const c = openRoomDocument(id, user, myRole)
    collab = c
    clientId.value = c.doc.clientID
    const refresh = (): void => {
      frame.value = readFrameView(c.doc)
      cuts.value = readRoomCuts(c.doc)
      // a peer may delete the point I have selected: let go of it rather than hold a ghost
      const sel = selection.value
      if (sel && !frame.value.loops.some((l) => l.id === sel.loopId && l.points.some((p) => p.id === sel.pointId)))
        select(null)
    }
    const undoState = (): void => {
      canUndo.value = c.undo.canUndo()
      canRedo.value = c.undo.canRedo()
    }
    c.doc.on('update', refresh)
    c.provider.on('status', (e) => {
      sync.value = e.status
    })
    c.provider.on('sync', (s) => {
      synced.value = s
      refresh()
    })
    for (const ev of ['stack-item-added', 'stack-item-popped', 'stack-cleared'] as const) c.undo.on(ev, undoState)
    cleanups.push(
      trackPeers(c.provider.awareness, (p) => {
        peers.value = p
      }),
    )
    const s = connectSurfaceStream({
      surface: onSurface,
      solveState: onSolveState,
      pattern: (m) => {
        if (m.roomId === roomId.value && (!pattern.value || m.version >= pattern.value.version)) pattern.value = m
      },
      solveProgress: (m) => {
        if (m.roomId === roomId.value && status.value.phase === 'settling')
          status.value = { ...status.value, iteration: m.iteration, residual: m.residual }
      },
      status: (connected, error) => {
        streamError.value = error ?? null
        if (!connected) status.value = { ...status.value, phase: 'offline' }
        // socket.io forgets rooms on reconnect: join again every time the connection comes up
        else if (!error) void join(s, id)
      },
    })
    stream = s
    socket.value = s.socket
    void loadUnderlay()
  }

  /** Reads whether the room has a site plan (and its scale); a failure just leaves none shown. */
  async function loadUnderlay(): Promise<void> {
    const id = roomId.value
    if (!id) return
    const meta = await getUnderlayMeta(id).catch(() => null)
    if (roomId.value === id) setUnderlay(meta)
  }

  /** Shows a new (or no) site plan, e.g. after the Files tab uploaded or removed one. */
  function setUnderlay(meta: UnderlayMeta | null): void {
    underlay.value = meta
    // a replaced image keeps its address: a new query string makes the browser fetch it again
    underlayUrl.value = meta && roomId.value ? `${roomPath(roomId.value)}/underlay?v=${++underlayStamp}` : null
  }

  async function join(s: SurfaceStream, id: string): Promise<void> {
    const result = await s.join(id)
    if (roomId.value !== id) return
    if (!result.ok) {
      streamError.value = result.error.message
      return
    }
    role.value = result.role
    if (status.value.phase === 'offline') status.value = { ...status.value, phase: 'waiting' }
  }

  /** Leaves the room and frees the document, socket and undo history. */
  function close(): void {
    cleanups.forEach((f) => f())
    cleanups = []
    if (stream && roomId.value) stream.leave(roomId.value)
    stream?.close()
    collab?.destroy()
    stream = null
    socket.value = null
    collab = null
    roomId.value = null
    frame.value = emptyFrame()
    surface.value = null
    pattern.value = null
    cuts.value = null
    selection.value = null
    peers.value = []
    underlay.value = null
    underlayUrl.value = null
    status.value = { phase: 'offline', version: 0 }
    synced.value = false
  }

  /**
   * Runs an edit as ours (undoable) unless read-only; returns the edit's result. Edits are their own
   * undo step unless `merge` (the moves of one drag merge into one step).
   */
  function edit<T>(run: (c: Collaboration) => T, merge = false): T | undefined {
    const c = collab
    if (!c || readOnly.value) return undefined
    if (!merge) c.undo.stopCapturing()
    const result = run(c)
    if (!merge) c.undo.stopCapturing()
    lastOwnClock.value = ownClock(c.doc)
    return result
  }

  /** Runs a seams edit (shared/room-doc/seams.ts) as our own undoable edit; undefined if read-only. */
  const editSeams = <T>(run: (doc: Y.Doc, origin: object) => T): T | undefined => edit((c) => run(c.doc, c.origin))

  /** Moves a frame point (m). */
  const move = (loopId: string, pointId: string, to: { x?: number; y?: number; z?: number }) =>
    edit((c) => edits.movePoint(c.doc, loopId, pointId, to, c.origin), true)
  /** Inserts a point on the edge that starts at `afterPointId` and selects it. */
  function insertAfter(loopId: string, afterPointId: string, at: { x: number; y: number; z: number }): void {
    const id = edit((c) => edits.insertPointAfter(c.doc, loopId, afterPointId, at, c.origin))
    if (id) select({ loopId, pointId: id })
  }
  /** Removes a point (a loop keeps at least three). */
  function removePoint(loopId: string, pointId: string): boolean {
    const ok = edit((c) => edits.deletePoint(c.doc, loopId, pointId, c.origin)) ?? false
    if (ok && selection.value?.pointId === pointId) select(null)
    return ok
  }
  /** Sets the edge that starts at a point: rigid, or cable with tension (kN). */
  const setEdge = (loopId: string, pointId: string, kind: EdgeKind, tension?: number) =>
    edit((c) => edits.setEdge(c.doc, loopId, pointId, kind, tension, c.origin))
  /** Adds a hole loop from ring points. */
  const addHole = (points: { x: number; y: number; z: number }[]) => edit((c) => edits.addHole(c.doc, points, c.origin))
  /** Removes a hole loop. */
  function removeHole(loopId: string): boolean {
    const ok = edit((c) => edits.removeHole(c.doc, loopId, c.origin)) ?? false
    if (ok && selection.value?.loopId === loopId) select(null)
    return ok
  }
  /** Sets prestress (kN/m), warp direction (degrees from +x) and/or element size (m). */
  const setSettings = (s: { warp?: number; fill?: number; warpAngle?: number; edgeLength?: number }) =>
    edit((c) => edits.setSettings(c.doc, s, c.origin))
  /**
   * Replaces the whole frame (a restored snapshot, an imported file) in one transaction with our
   * origin: peers see one change and one Undo brings the previous frame back. False if read-only.
   */
  function replaceFrame(next: Readonly<Frame>): boolean {
    const done = edit((c) => {
      writeFrame(c.doc, next, c.origin)
      return true
    })
    if (done) select(null)
    return done ?? false
  }
  /** Ends the current undo step, so the next edit undoes separately. */
  const stopCapturing = (): void => collab?.undo.stopCapturing()
  /**
   * Starts a gesture (a drag): all its moves become one undo step however slowly they arrive, until
   * endGesture. Without this, a pause longer than the capture timeout would split one drag.
   */
  function beginGesture(): void {
    if (!collab) return
    collab.undo.stopCapturing()
    collab.undo.captureTimeout = Number.POSITIVE_INFINITY
  }
  /** Ends a gesture started with beginGesture. */
  function endGesture(): void {
    if (!collab) return
    collab.undo.captureTimeout = CAPTURE_TIMEOUT_MS
    collab.undo.stopCapturing()
  }
  /** Undoes my own latest edit (never a peer's). */
  const undo = (): void => void edit((c) => c.undo.undo(), true)
  /** Redoes my own latest undone edit. */
  const redo = (): void => void edit((c) => c.undo.redo(), true)

  /** Selects a point (or none) and shows peers that I hold it. */
  function select(sel: HeldPoint | null): void {
    selection.value = sel
    collab?.hold(sel)
  }

  return {
    roomId,
    role,
    readOnly,
    frame,
    rows,
    selection,
    surface,
    pattern,
    cuts,
    editSeams,
    figures,
    status,
    sync,
    synced,
    streamError,
    colourMode,
    viewMode,
    snapOn,
    snapStep,
    peers,
    underlay,
    underlayUrl,
    underlayVisible,
    underlayOpacity,
    loadUnderlay,
    setUnderlay,
    canUndo,
    canRedo,
    surfaceIncludesMine,
    socket,
    open,
    close,
    move,
    insertAfter,
    removePoint,
    setEdge,
    addHole,
    removeHole,
    setSettings,
    replaceFrame,
    stopCapturing,
    beginGesture,
    endGesture,
    undo,
    redo,
    select,
  }
})
