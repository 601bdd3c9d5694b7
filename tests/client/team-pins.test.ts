import { describe, expect, it } from 'vitest'
import type { Pin } from '../../src/api/team'
import {
  canAddPins,
  canResolvePins,
  filterPins,
  isPinAuthor,
  pinCounts,
  upsertPin,
} from '../../src/composables/use-pin-filters'

const pin = (id: string, authorId: string, resolved: boolean, updatedAt: string): Pin => ({
  id,
  x: 0,
  y: 0,
  z: 0,
  docVersion: 1,
  body: `pin ${id}`,
  resolved,
  author: { id: authorId, name: authorId },
  createdAt: '2026-01-01T00:00:00.000Z',
  updatedAt,
  replies: [],
})

const pins = [
  pin('a', 'me', false, '2026-01-01T10:00:00.000Z'),
  pin('b', 'other', true, '2026-01-01T12:00:00.000Z'),
  pin('c', 'other', false, '2026-01-01T11:00:00.000Z'),
  pin('d', 'me', true, '2026-01-01T09:00:00.000Z'),
]
const ids = (list: Pin[]) => list.map((p) => p.id)

// The filter rules are the server's (server/modules/pins/pins-schema.ts: GET …/pins?status=open|resolved|all&mine=1);
// the client filters locally so live pin:changed events land without a refetch, and must agree.
describe('pin filters', () => {
  it('keeps only open, only resolved, or all pins, newest activity first', () => {
    expect(ids(filterPins(pins, { status: 'open', mine: false }, 'me'))).toEqual(['c', 'a'])
    expect(ids(filterPins(pins, { status: 'resolved', mine: false }, 'me'))).toEqual(['b', 'd'])
    expect(ids(filterPins(pins, { status: 'all', mine: false }, 'me'))).toEqual(['b', 'c', 'a', 'd'])
  })

  it('"mine" keeps pins I wrote, and nothing when nobody is signed in', () => {
    expect(ids(filterPins(pins, { status: 'all', mine: true }, 'me'))).toEqual(['a', 'd'])
    expect(ids(filterPins(pins, { status: 'open', mine: true }, 'me'))).toEqual(['a'])
    expect(filterPins(pins, { status: 'all', mine: true }, undefined)).toEqual([])
  })

  it('counts open, resolved and mine', () => {
    expect(pinCounts(pins, 'me')).toEqual({ open: 2, resolved: 2, mine: 2 })
    expect(pinCounts([], 'me')).toEqual({ open: 0, resolved: 0, mine: 0 })
  })

  it('merges a live change, but an older copy never overwrites a newer one', () => {
    const newer = { ...pins[0]!, resolved: true, updatedAt: '2026-01-01T13:00:00.000Z' }
    const merged = upsertPin(pins, newer)
    expect(merged.find((p) => p.id === 'a')?.resolved).toBe(true)
    expect(upsertPin(merged, pins[0]!).find((p) => p.id === 'a')?.resolved).toBe(true)
    expect(ids(upsertPin(pins, pin('e', 'x', false, '2026-01-02T00:00:00.000Z')))).toEqual(['a', 'b', 'c', 'd', 'e'])
  })

  // Role rules from PRODUCT.md "Words" (reviewer: pins only) and server/modules/pins/README.md
  // (resolve: editor and up; text and delete: author only).
  it('applies the role and authorship rules', () => {
    expect(['owner', 'editor', 'reviewer', 'viewer'].map((r) => canResolvePins(r as never))).toEqual([
      true,
      true,
      false,
      false,
    ])
    expect(['owner', 'editor', 'reviewer', 'viewer'].map((r) => canAddPins(r as never))).toEqual([
      true,
      true,
      true,
      false,
    ])
    expect(isPinAuthor(pins[0]!, 'me')).toBe(true)
    expect(isPinAuthor(pins[1]!, 'me')).toBe(false)
    expect(isPinAuthor(pins[0]!, undefined)).toBe(false)
  })
})

describe('pins store live events', () => {
  // Event names and payloads from shared/protocol/pins.ts and events.ts:
  // pin:changed { roomId, pin } and pin:deleted { roomId, pinId }.
  it('merges pin:changed and drops pin:deleted for its own room only', async () => {
    const { createPinia, setActivePinia } = await import('pinia')
    const { usePinsStore } = await import('../../src/stores/pins')
    setActivePinia(createPinia())
    const store = usePinsStore()
    store.roomId = 'room-1'
    const listeners = new Map<string, (p: unknown) => void>()
    const source = {
      on: (e: string, f: (p: unknown) => void) => listeners.set(e, f),
      off: (e: string) => listeners.delete(e),
    }
    const stop = store.listen(source)
    const changed = listeners.get('pin:changed')!
    changed({ roomId: 'room-1', pin: pins[0] })
    changed({ roomId: 'room-2', pin: pins[1] })
    changed({ roomId: 'room-1', pin: { ...pins[2], x: 'not a number' } })
    expect(ids(store.pins)).toEqual(['a'])
    store.selectedId = 'a'
    listeners.get('pin:deleted')!({ roomId: 'room-2', pinId: 'a' })
    expect(ids(store.pins)).toEqual(['a'])
    listeners.get('pin:deleted')!({ roomId: 'room-1', pinId: 'a' })
    expect(store.pins).toEqual([])
    expect(store.selectedId).toBeNull()
    stop()
    expect(listeners.size).toBe(0)
  })
})
