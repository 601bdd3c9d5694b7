import { ref } from 'vue'
import { defineStore } from 'pinia'
import * as team from '../api/team'
import { pinChangedEventSchema, pinDeletedEventSchema, type Pin } from '../../shared/protocol'
import { upsertPin } from '../composables/use-pin-filters'

/** The part of a socket.io client the pins store listens on (the workbench's socket or our own). */
export interface PinEventSource {
  on(event: string, listener: (payload: unknown) => void): unknown
  off(event: string, listener: (payload: unknown) => void): unknown
}

export const usePinsStore = defineStore('pins', () => {
  const roomId = ref<string | null>(null)
  const pins = ref<Pin[]>([])
  const loading = ref(false)
  /** The pin chosen in the panel or by clicking its marker. */
  const selectedId = ref<string | null>(null)
  /** A surface point picked for a new pin, waiting for its text. */
  const draft = ref<{ x: number; y: number; z: number; docVersion: number } | null>(null)

  function room(): string {
    if (!roomId.value) throw new Error('pins store: load(roomId) first')
    return roomId.value
  }

  // Changes seen (events, replies) while a list request is in flight: its reply was read before
  // them, so they are applied again on top of it instead of being lost. Only the latest request's
  // reply is used.
  const inFlight = new Set<Map<string, Pin | null>>()
  let latest = 0

  /** Loads every pin of a room (filters are applied in the panel, so live events fit in). */
  async function load(id: string): Promise<void> {
    if (roomId.value !== id) pins.value = []
    roomId.value = id
    loading.value = true
    const mine = ++latest
    const seen = new Map<string, Pin | null>()
    inFlight.add(seen)
    try {
      let list = await team.listPins(id)
      if (roomId.value !== id || mine !== latest) return
      for (const [pinId, pin] of seen) list = pin ? upsertPin(list, pin) : list.filter((p) => p.id !== pinId)
      pins.value = list
    } finally {
      inFlight.delete(seen)
      if (mine === latest) loading.value = false
    }
  }

  function merge(pin: Pin): Pin {
    for (const seen of inFlight) seen.set(pin.id, pin)
    pins.value = upsertPin(pins.value, pin)
    return pin
  }

  /** Pins a comment to a point of the surface (m) solved from document version `docVersion`. */
  async function createPinAt(at: { x: number; y: number; z: number }, docVersion: number, body: string): Promise<Pin> {
    const pin = merge(await team.createPin(room(), { x: at.x, y: at.y, z: at.z, docVersion, body: body.trim() }))
    selectedId.value = pin.id
    draft.value = null
    return pin
  }
  /** Starts a new pin at a picked surface point (m); the panel then asks for its text. */
  function startDraft(at: { x: number; y: number; z: number }, docVersion: number): void {
    draft.value = { x: at.x, y: at.y, z: at.z, docVersion }
    selectedId.value = null
  }
  /** Drops the pending new pin. */
  const cancelDraft = (): void => void (draft.value = null)

  /** Adds a reply to a pin's thread. */
  const reply = async (pinId: string, body: string) => merge(await team.replyToPin(room(), pinId, body.trim()))
  /** Resolves or reopens (editor and up). */
  const setResolved = async (pinId: string, resolved: boolean) =>
    merge(await team.patchPin(room(), pinId, { resolved }))
  /** Changes the text (author only). */
  const editBody = async (pinId: string, body: string) =>
    merge(await team.patchPin(room(), pinId, { body: body.trim() }))
  /** Deletes a pin (author only). */
  async function remove(pinId: string): Promise<void> {
    await team.deletePin(room(), pinId)
    dropLocal(pinId)
  }

  function dropLocal(pinId: string): void {
    for (const seen of inFlight) seen.set(pinId, null)
    pins.value = pins.value.filter((p) => p.id !== pinId)
    if (selectedId.value === pinId) selectedId.value = null
  }

  /** Follows `pin:changed` / `pin:deleted` for the loaded room; returns the unsubscribe function. */
  function listen(source: PinEventSource): () => void {
    // a payload that does not parse is dropped: the next reload (on reconnect) brings the truth
    const changed = (raw: unknown): void => {
      const m = pinChangedEventSchema.safeParse(raw)
      if (m.success && m.data.roomId === roomId.value) merge(m.data.pin)
    }
    const deleted = (raw: unknown): void => {
      const m = pinDeletedEventSchema.safeParse(raw)
      if (m.success && m.data.roomId === roomId.value) dropLocal(m.data.pinId)
    }
    source.on('pin:changed', changed)
    source.on('pin:deleted', deleted)
    return () => {
      source.off('pin:changed', changed)
      source.off('pin:deleted', deleted)
    }
  }

  return {
    roomId,
    pins,
    loading,
    selectedId,
    draft,
    load,
    startDraft,
    cancelDraft,
    createPinAt,
    reply,
    setResolved,
    editBody,
    remove,
    listen,
  }
})
