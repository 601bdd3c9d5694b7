import { randomUUID } from 'node:crypto'
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { RoomRole } from '../../server/db/entities/index.js'
import { solveFrame } from '../../shared/engine.js'
import { parseFrameJson } from '../../shared/frame/index.js'
import { uniqueEmail, type ApiClient } from '../helpers/test-server.js'
import {
  addMember,
  download,
  engineLive,
  roomWithCast,
  sendForm,
  startTeamworkServer,
  type RoomCast,
  type TeamworkServer,
} from './teamwork-helpers.js'

// Every team-work room route against every kind of caller, from one table: signed out → 401,
// not a member → 404 (rooms are not probeable), role below the route's minimum → 403, else the
// route's success status. The rule is the product's role table (PRODUCT.md "Words").
type Who = RoomRole | 'outsider' | 'signedOut'
const callers: Who[] = ['owner', 'editor', 'reviewer', 'viewer', 'outsider', 'signedOut']
const rank: Record<RoomRole, number> = { owner: 4, editor: 3, reviewer: 2, viewer: 1 }
const expected = (who: Who, min: RoomRole, ok: number) =>
  who === 'signedOut' ? 401 : who === 'outsider' ? 404 : rank[who] >= rank[min] ? ok : 403

const example = readFileSync(resolve(import.meta.dirname, '../../examples/hypar-sail.json'), 'utf8')
const png = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAIAAACQd1PeAAAADElEQVR4nGP4//8/AAX+Av4N70a4AAAAAElFTkSuQmCC',
  'base64',
)

const engine = engineLive((f) => solveFrame(f))
let tw: TeamworkServer
let cast: RoomCast
beforeAll(async () => {
  tw = await startTeamworkServer(engine.live)
  cast = await roomWithCast(tw, 'Role table room')
  engine.setFrame({ ...parseFrameJson(example), mesh: { edgeLength: 0.5 } })
})
afterAll(async () => {
  await tw?.stop()
})

const room = () => `/api/rooms/${cast.roomId}`
const owner = () => cast.clients.owner
const form = (field: string, name: string, bytes: string | Buffer, fields: Record<string, string> = {}) => {
  const f = new FormData()
  f.append(field, new Blob([typeof bytes === 'string' ? bytes : new Uint8Array(bytes)]), name)
  for (const [k, v] of Object.entries(fields)) f.append(k, v)
  return f
}
const scale = { ax: '0', ay: '0', bx: '100', by: '0', distance: '10' }
const ensureUnderlay = () => sendForm(owner(), 'PUT', `${room()}/underlay`, form('image', 'u.png', png, scale))
const newPin = async (c: ApiClient, who: Who) => {
  const author = who === 'owner' || who === 'editor' || who === 'reviewer' ? c : owner()
  return (await author.post(`${room()}/pins`, { x: 1, y: 2, z: 3, docVersion: 1, body: 'a pin' })).body.pin.id as string
}
const newSnapshot = async () =>
  (await owner().post(`${room()}/snapshots`, { name: `s-${randomUUID().slice(0, 6)}` })).body.snapshot.id as string
const extraMember = async () => {
  const c = tw.client()
  const u = await c.post('/api/auth/signup', {
    email: uniqueEmail('extra'),
    name: 'Extra',
    password: 'long-enough-pass',
  })
  await addMember(tw.server.dataSource, cast.roomId, u.body.user.id, 'viewer')
  return u.body.user.id as string
}

interface Row {
  route: string
  min: RoomRole
  ok: number
  call: (c: ApiClient, who: Who) => Promise<{ status: number }>
}

const downloads = ['frame.json', 'surface.obj', 'surface.stl', 'figures.csv']
const rows: Row[] = [
  {
    route: 'POST invites',
    min: 'owner',
    ok: 201,
    call: (c) => c.post(`${room()}/invites`, { email: uniqueEmail('inv'), role: 'viewer' }),
  },
  { route: 'GET invites', min: 'owner', ok: 200, call: (c) => c.get(`${room()}/invites`) },
  {
    route: 'DELETE invites/:inviteId',
    min: 'owner',
    ok: 204,
    call: async (c) =>
      c.delete(
        `${room()}/invites/${(await owner().post(`${room()}/invites`, { email: uniqueEmail('inv'), role: 'viewer' })).body.invite.id}`,
      ),
  },
  {
    route: 'PATCH members/:userId',
    min: 'owner',
    ok: 200,
    call: async (c) => c.patch(`${room()}/members/${await extraMember()}`, { role: 'reviewer' }),
  },
  {
    route: 'DELETE members/:userId (someone else)',
    min: 'owner',
    ok: 204,
    call: async (c) => c.delete(`${room()}/members/${await extraMember()}`),
  },
  { route: 'GET pins', min: 'viewer', ok: 200, call: (c) => c.get(`${room()}/pins?status=all`) },
  {
    route: 'POST pins',
    min: 'reviewer',
    ok: 201,
    call: (c) => c.post(`${room()}/pins`, { x: 0, y: 0, z: 1, docVersion: 3, body: 'hello' }),
  },
  {
    route: 'POST pins/:pinId/replies',
    min: 'reviewer',
    ok: 201,
    call: async (c, who) => c.post(`${room()}/pins/${await newPin(c, who)}/replies`, { body: 're' }),
  },
  {
    route: 'PATCH pins/:pinId { body } (own pin)',
    min: 'reviewer',
    ok: 200,
    call: async (c, who) => c.patch(`${room()}/pins/${await newPin(c, who)}`, { body: 'edited' }),
  },
  {
    route: 'PATCH pins/:pinId { resolved }',
    min: 'editor',
    ok: 200,
    call: async (c, who) => c.patch(`${room()}/pins/${await newPin(c, who)}`, { resolved: true }),
  },
  {
    route: 'DELETE pins/:pinId (own pin)',
    min: 'reviewer',
    ok: 204,
    call: async (c, who) => c.delete(`${room()}/pins/${await newPin(c, who)}`),
  },
  { route: 'GET snapshots', min: 'viewer', ok: 200, call: (c) => c.get(`${room()}/snapshots`) },
  {
    route: 'POST snapshots',
    min: 'editor',
    ok: 201,
    call: (c) => c.post(`${room()}/snapshots`, { name: 'role check' }),
  },
  {
    route: 'GET snapshots/:sid',
    min: 'viewer',
    ok: 200,
    call: async (c) => c.get(`${room()}/snapshots/${await newSnapshot()}`),
  },
  {
    route: 'GET snapshots/:sid/surface',
    min: 'viewer',
    ok: 200,
    call: async (c) => c.get(`${room()}/snapshots/${await newSnapshot()}/surface`),
  },
  {
    route: 'DELETE snapshots/:sid',
    min: 'editor',
    ok: 204,
    call: async (c) => c.delete(`${room()}/snapshots/${await newSnapshot()}`),
  },
  {
    route: 'POST frame/import',
    min: 'editor',
    ok: 200,
    call: (c) => sendForm(c, 'POST', `${room()}/frame/import`, form('file', 'f.json', example)),
  },
  {
    route: 'PUT underlay',
    min: 'editor',
    ok: 200,
    call: (c) => sendForm(c, 'PUT', `${room()}/underlay`, form('image', 'u.png', png, scale)),
  },
  {
    route: 'GET underlay',
    min: 'viewer',
    ok: 200,
    call: async (c) => (await ensureUnderlay(), download(c, `${room()}/underlay`)),
  },
  {
    route: 'GET underlay/meta',
    min: 'viewer',
    ok: 200,
    call: async (c) => (await ensureUnderlay(), c.get(`${room()}/underlay/meta`)),
  },
  {
    route: 'DELETE underlay',
    min: 'editor',
    ok: 204,
    call: async (c) => (await ensureUnderlay(), c.delete(`${room()}/underlay`)),
  },
  ...downloads.map((kind): Row => ({
    route: `GET ${kind}`,
    min: 'viewer',
    ok: 200,
    call: (c) => download(c, `${room()}/${kind}`),
  })),
  ...downloads.map((kind): Row => ({
    route: `GET snapshots/:sid/${kind}`,
    min: 'viewer',
    ok: 200,
    call: async (c) => download(c, `${room()}/snapshots/${await newSnapshot()}/${kind}`),
  })),
]

describe('team-work routes × roles', () => {
  it.each(rows)('$route (minimum $min)', async (row) => {
    const got: Record<string, number> = {}
    const want: Record<string, number> = {}
    for (const who of callers) {
      got[who] = (await row.call(cast.clients[who], who)).status
      want[who] = expected(who, row.min, row.ok)
    }
    expect(got).toEqual(want)
  })
})

describe('CSRF on team-work routes', () => {
  it('refuses a state-changing request without the x-csrf-token header (403 csrf_invalid)', async () => {
    const reply = await owner().request(
      'POST',
      `${room()}/pins`,
      { x: 0, y: 0, z: 0, docVersion: 0, body: 'no token' },
      { csrf: false },
    )
    expect(reply.status).toBe(403)
    expect(reply.body.error.code).toBe('csrf_invalid')
    const invite = await owner().request(
      'POST',
      `${room()}/invites`,
      { email: uniqueEmail(), role: 'viewer' },
      { csrf: false },
    )
    expect(invite.status).toBe(403)
  })
})
