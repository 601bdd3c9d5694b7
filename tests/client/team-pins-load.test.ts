import { beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import type { Pin } from '../../src/api/team'

// The list request is held open by the test, so a live event can arrive while it is in flight.
let release: (pins: Pin[]) => void = () => {}
vi.mock('../../src/api/team', async (original) => ({
  ...(await original<typeof import('../../src/api/team')>()),
  listPins: vi.fn(() => new Promise<Pin[]>((resolve) => (release = resolve))),
}))
const { usePinsStore } = await import('../../src/stores/pins')

const pin = (id: string, updatedAt = '2026-01-01T10:00:00.000Z'): Pin => ({
  id,
  x: 0,
  y: 0,
  z: 0,
  docVersion: 1,
  body: id,
  resolved: false,
  author: { id: 'u', name: 'U' },
  createdAt: '2026-01-01T10:00:00.000Z',
  updatedAt,
  replies: [],
})

function fakeSocket() {
  const listeners = new Map<string, (p: unknown) => void>()
  return {
    listeners,
    on: (e: string, f: (p: unknown) => void) => listeners.set(e, f),
    off: (e: string) => listeners.delete(e),
  }
}

describe('pins store: a list reply older than live events', () => {
  beforeEach(() => setActivePinia(createPinia()))

  // Seen in the browser test: the owner's first GET …/pins was answered after pin:changed for a
  // pin created meanwhile, and the pin vanished again. The reply must not undo newer events.
  it('keeps a pin that arrived by event while the list was loading', async () => {
    const store = usePinsStore()
    const socket = fakeSocket()
    store.roomId = 'r'
    store.listen(socket)
    const loading = store.load('r')
    socket.listeners.get('pin:changed')!({ roomId: 'r', pin: pin('new') })
    release([pin('old')])
    await loading
    expect(store.pins.map((p) => p.id).sort()).toEqual(['new', 'old'])
  })

  it('does not bring back a pin deleted while the list was loading', async () => {
    const store = usePinsStore()
    const socket = fakeSocket()
    store.roomId = 'r'
    store.listen(socket)
    const loading = store.load('r')
    socket.listeners.get('pin:deleted')!({ roomId: 'r', pinId: 'gone' })
    release([pin('gone'), pin('kept')])
    await loading
    expect(store.pins.map((p) => p.id)).toEqual(['kept'])
  })

  it('uses only the latest of two overlapping loads', async () => {
    const store = usePinsStore()
    const first = store.load('r')
    const releaseFirst = release
    const second = store.load('r')
    release([pin('a'), pin('b')])
    await second
    releaseFirst([pin('a')])
    await first
    expect(store.pins.map((p) => p.id)).toEqual(['a', 'b'])
    expect(store.loading).toBe(false)
  })
})
