import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import { roomNotFound } from './room-access.js'
import { roomsRepository, type MemberView, type RoomView } from './rooms-repository.js'
import type { CreateRoomBody, UpdateRoomBody } from './rooms-schema.js'

/** Room rules. Role checks happen in requireRoomAction (shared/protocol/roles.ts) before these run. */
export function roomsService(dataSource: DataSource) {
  const rooms = roomsRepository(dataSource)

  async function get(roomId: string, userId: string): Promise<RoomView> {
    const room = await rooms.findForUser(roomId, userId)
    if (!room) throw roomNotFound()
    return room
  }

  return {
    list: (userId: string) => rooms.listForUser(userId),
    get,

    /** Creates a room; its creator becomes the owner. */
    async create(input: CreateRoomBody, userId: string): Promise<RoomView> {
      const id = randomUUID()
      await dataSource.transaction((em) =>
        rooms.insertWithMember(
          em,
          { id, name: input.name, description: input.description },
          { id: randomUUID(), userId, role: 'owner' },
        ),
      )
      return get(id, userId)
    },

    async update(roomId: string, patch: UpdateRoomBody, userId: string): Promise<RoomView> {
      await rooms.update(roomId, patch)
      return get(roomId, userId)
    },

    /** Deletes the room with everything in it (members, invites, document, snapshots, pins cascade). */
    remove: (roomId: string) => rooms.delete(roomId),

    members: (roomId: string): Promise<MemberView[]> => rooms.members(roomId),
  }
}

export type RoomsService = ReturnType<typeof roomsService>
