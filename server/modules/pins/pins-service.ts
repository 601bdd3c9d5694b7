import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import type { RoomRole, User } from '../../db/entities/index.js'
import { forbidden, notFound } from '../../lib/app-error.js'
import { can } from '../../../shared/protocol/index.js'
import type { LiveRoomPort } from '../../live-room-port/index.js'
import { pinsRepository, type PinRow } from './pins-repository.js'
import type { CreatePinBody, ListPinsQuery, PatchPinBody } from './pins-schema.js'

const person = (u: User | null | undefined) => (u ? { id: u.id, name: u.name } : null)

/** The pin as the API and the `pin:changed` event show it. */
export function pinView(p: PinRow) {
  return {
    id: p.id,
    x: p.x,
    y: p.y,
    z: p.z,
    docVersion: p.docVersion,
    body: p.body,
    resolved: p.resolved,
    author: person(p.author),
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
    replies: p.replies.map((r) => ({
      id: r.id,
      body: r.body,
      author: person(r.author),
      createdAt: r.createdAt.toISOString(),
    })),
  }
}
export type PinView = ReturnType<typeof pinView>

const pinNotFound = () => notFound('pin_not_found', 'No such pin in this room (it may have been deleted).')

/** Review pins. Route guards ensure reviewer or higher for every write; the rules below add authorship. */
export function pinsService(dataSource: DataSource, live: Pick<LiveRoomPort, 'emitToRoom'>) {
  const repo = pinsRepository(dataSource)

  async function load(roomId: string, pinId: string): Promise<PinRow> {
    const pin = await repo.findOne(roomId, pinId)
    if (!pin) throw pinNotFound()
    return pin
  }
  async function changed(roomId: string, pinId: string): Promise<PinView> {
    const pin = pinView(await load(roomId, pinId))
    live.emitToRoom(roomId, 'pin:changed', { roomId, pin })
    return pin
  }

  return {
    async list(roomId: string, q: ListPinsQuery, userId: string): Promise<PinView[]> {
      const resolved = q.status === 'all' ? undefined : q.status === 'resolved'
      const rows = await repo.list(roomId, { resolved, authorId: q.mine === '1' ? userId : undefined })
      return rows.map(pinView)
    },

    async create(roomId: string, input: CreatePinBody, userId: string): Promise<PinView> {
      const id = randomUUID()
      await repo.insert({ id, roomId, authorId: userId, ...input })
      return changed(roomId, id)
    },

    async reply(roomId: string, pinId: string, body: string, userId: string): Promise<PinView> {
      await load(roomId, pinId)
      await repo.insertReply({ id: randomUUID(), pinId, authorId: userId, body })
      await repo.touch(pinId)
      return changed(roomId, pinId)
    },

    /** Text: author only. Resolved flag: editor and up (the author alone cannot close a review). */
    async patch(
      roomId: string,
      pinId: string,
      patch: PatchPinBody,
      actor: { id: string; role: RoomRole },
    ): Promise<PinView> {
      const pin = await load(roomId, pinId)
      if (patch.body !== undefined && pin.authorId !== actor.id)
        throw forbidden('Only the pin’s author can change its text.')
      if (patch.resolved !== undefined && !can(actor.role, 'resolvePin')) {
        throw forbidden('Only editors and owners can resolve or reopen a pin.')
      }
      await repo.update(pinId, patch)
      return changed(roomId, pinId)
    },

    async remove(roomId: string, pinId: string, actorId: string): Promise<void> {
      const pin = await load(roomId, pinId)
      if (pin.authorId !== actorId) throw forbidden('Only the pin’s author can delete it.')
      await repo.delete(pinId)
      live.emitToRoom(roomId, 'pin:deleted', { roomId, pinId })
    },
  }
}
