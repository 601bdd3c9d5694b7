import { afterEach, describe, expect, it, vi } from 'vitest'
import { nextTick, ref } from 'vue'
import { useRoomPage } from '../../src/composables/use-room-page'

// Contract (issue 2): GET /api/rooms/:id and /members answer 404 'room_not_found' for a room that
// does not exist or that I am not a member of.

const roomJson = (id: string) => ({
  id,
  name: `Room ${id}`,
  description: '',
  role: 'viewer',
  memberCount: 1,
  updatedAt: '2026-11-30T10:00:00.000Z',
  createdAt: '2026-11-30T10:00:00.000Z',
})

function json(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } })
}

/** Resolves once every pending promise callback has run. */
const settle = () => new Promise((r) => setTimeout(r, 0))

afterEach(() => vi.unstubAllGlobals())

describe('useRoomPage', () => {
  it('keeps the room of the current id when an older, slower reply arrives last', async () => {
    // Each id makes two requests (room, members); hold both until the test lets them through.
    const waiting: Record<string, (() => void)[]> = {}
    const release = (id: string) => (waiting[id] ?? []).splice(0).forEach((go) => go())
    vi.stubGlobal(
      'fetch',
      vi.fn(async (path: string) => {
        const id = path.split('/')[3] ?? ''
        await new Promise<void>((r) => (waiting[id] ??= []).push(r))
        return path.endsWith('/members') ? json(200, { members: [] }) : json(200, { room: roomJson(id) })
      }),
    )
    const id = ref('slow')
    const page = useRoomPage(id)
    id.value = 'fast'
    await nextTick()
    await settle()
    release('fast')
    await settle()
    expect(page.room.value?.id).toBe('fast')
    release('slow')
    await settle()
    expect(page.room.value?.id).toBe('fast')
    expect(page.loading.value).toBe(false)
  })

  it('marks a 404 as missing rather than as an error', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => json(404, { error: { code: 'room_not_found', message: 'No such room' } })),
    )
    const page = useRoomPage(ref('gone'))
    await settle()
    await settle()
    expect(page.missing.value).toBe(true)
    expect(page.error.value).toBeNull()
    expect(page.room.value).toBeNull()
  })

  it('shows other failures as an error the user can retry', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => json(500, { error: { code: 'internal', message: 'Database is down' } })),
    )
    const page = useRoomPage(ref('r1'))
    await settle()
    await settle()
    expect(page.missing.value).toBe(false)
    expect(page.error.value).toBe('Database is down')
  })
})
