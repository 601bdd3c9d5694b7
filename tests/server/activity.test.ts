import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import * as Y from 'yjs'
import { movePoint } from '../../shared/room-doc/edits.js'
import { loopsOf } from '../../shared/room-doc/schema.js'
import { describeFrameChange } from '../../server/modules/activity/frame-change.js'
import {
  connectDoc,
  makeRoom,
  makeUser,
  signIn,
  startLive,
  until,
  type DocClient,
  type Live,
} from '../realtime/live-helpers.js'

// Issue 16: the rooms list's "Last change" names the editor and the edit; open pins are counted.

let live: Live
const clients: DocClient[] = []
let owner: { id: string; cookie: string }
let editor: { id: string; cookie: string }
let busy = ''
let quiet = ''

async function person(name: string) {
  const u = await makeUser(live.running.dataSource, name.split(' ')[0]!)
  await live.running.dataSource.query('UPDATE users SET name = ? WHERE id = ?', [name, u.id])
  return { id: u.id, cookie: await signIn(live.url, u.email) }
}

async function api<T>(who: { cookie: string }, method: string, path: string, body?: unknown): Promise<T> {
  const headers: Record<string, string> = { cookie: who.cookie, 'content-type': 'application/json' }
  if (method !== 'GET')
    headers['x-csrf-token'] = (
      (await (await fetch(`${live.url}/api/auth/csrf`, { headers })).json()) as { token: string }
    ).token
  const res = await fetch(live.url + path, {
    method,
    headers,
    body: body === undefined ? undefined : JSON.stringify(body),
  })
  if (!res.ok) throw new Error(`${method} ${path}: ${res.status} ${await res.text()}`)
  return (await res.json()) as T
}

type Activity = {
  lastChange: { at: string; by: string | null; what: string } | null
  openPins: number
  myOpenPins: number
}
const activityOf = async (who: { cookie: string }) =>
  (await api<{ rooms: Record<string, Activity> }>(who, 'GET', '/api/activity/rooms')).rooms

beforeAll(async () => {
  live = await startLive()
  owner = await person('Imke Owner')
  editor = await person('Tobias Editor')
  quiet = await makeRoom(live.running.dataSource, [
    { userId: owner.id, role: 'owner' },
    { userId: editor.id, role: 'editor' },
  ])
  busy = await makeRoom(live.running.dataSource, [
    { userId: owner.id, role: 'owner' },
    { userId: editor.id, role: 'editor' },
  ])
})
afterAll(async () => {
  for (const c of clients) c.destroy()
  await live?.stop()
})

describe('rooms list activity', () => {
  it('an edit through the sync socket becomes the last change, with the editor and what moved', async () => {
    const c = connectDoc(live.url, busy, editor.cookie)
    clients.push(c)
    await c.synced
    await until(() => loopsOf(c.doc).length > 0, 10_000, 'the starting frame')
    const outer = loopsOf(c.doc).get(0)
    const first = (outer.get('points') as Y.Array<Y.Map<unknown>>).get(0)
    movePoint(c.doc, outer.get('id') as string, first.get('id') as string, { x: (first.get('x') as number) + 0.5 })
    let mine: Activity | undefined
    const end = Date.now() + 15_000
    while (Date.now() < end) {
      await live.running.activity.recorder.flushAll()
      mine = (await activityOf(owner))[busy]
      if (mine?.lastChange?.what.startsWith('moved')) break
      await new Promise((r) => setTimeout(r, 100))
    }
    expect(mine?.lastChange).toMatchObject({ by: 'Tobias Editor', what: 'moved Outer P1' })
    const rooms = await activityOf(owner)
    // The edited room sorts above the one nobody touched.
    expect(Date.parse(rooms[busy]!.lastChange!.at)).toBeGreaterThan(
      Date.parse(rooms[quiet]!.lastChange?.at ?? '1970-01-01'),
    )
  })

  it('a pin raises the open count, and counts as mine for its author only', async () => {
    expect((await activityOf(owner))[busy]).toMatchObject({ openPins: 0, myOpenPins: 0 })
    await api(editor, 'POST', `/api/rooms/${busy}/pins`, {
      x: 1,
      y: 1,
      z: 1,
      docVersion: 0,
      body: 'Check the low corner for ponding.',
    })
    expect((await activityOf(owner))[busy]).toMatchObject({ openPins: 1, myOpenPins: 0 })
    expect((await activityOf(editor))[busy]).toMatchObject({ openPins: 1, myOpenPins: 1 })
    expect((await activityOf(owner))[busy]!.lastChange).toMatchObject({ by: 'Tobias Editor', what: 'pinned a comment' })
  })
})

describe('describeFrameChange', () => {
  const frame = (pts: [string, number, number, number][], holes = 0) => ({
    loops: [
      {
        role: 'outer',
        points: pts.map(([id, x, y, z]) => ({ id, x, y, z })),
        edges: pts.map(() => ({ kind: 'rigid' })),
      },
    ].concat(Array.from({ length: holes }, () => ({ role: 'hole', points: [], edges: [] }))),
    prestress: { warp: 2, fill: 2 },
    mesh: { edgeLength: 0.3 },
  })
  const base = frame([
    ['a', 0, 0, 0],
    ['b', 4, 0, 0],
    ['c', 4, 4, 1],
    ['d', 0, 4, 1],
  ])
  it.each([
    [
      frame([
        ['a', 0, 0, 0],
        ['b', 4, 0, 0],
        ['c', 4, 4, 1],
        ['d', 0, 4.5, 1],
      ]),
      'moved Outer P4',
    ],
    [
      frame([
        ['a', 0, 0, 0],
        ['b', 4, 0, 0.5],
        ['c', 4, 4, 1],
        ['d', 0, 4, 1],
      ]),
      'changed the height of Outer P2',
    ],
    [
      frame([
        ['a', 1, 0, 0],
        ['b', 5, 0, 0],
        ['c', 4, 4, 1],
        ['d', 0, 4, 1],
      ]),
      'moved 2 points',
    ],
    [
      frame(
        [
          ['a', 0, 0, 0],
          ['b', 4, 0, 0],
          ['c', 4, 4, 1],
          ['d', 0, 4, 1],
        ],
        1,
      ),
      'added a hole',
    ],
    [
      frame([
        ['a', 0, 0, 0],
        ['b', 4, 0, 0],
        ['c', 4, 4, 1],
      ]),
      'removed a point from Outer',
    ],
    [
      frame([
        ['w', 0, 0, 0],
        ['x', 4, 0, 0],
        ['y', 4, 4, 1],
        ['z', 0, 4, 1],
      ]),
      'replaced the frame',
    ],
    [{ ...base, prestress: { warp: 3, fill: 2 } }, 'changed the prestress'],
    ['not a frame', 'edited the frame'],
  ])('%# → %s', (after, words) => {
    expect(describeFrameChange(base, after)).toBe(words)
  })
})
