import type { DataSource } from 'typeorm'
import type { RoomRole } from '../../db/entities/index.js'
import { AppError, forbidden, notFound } from '../../lib/app-error.js'
import type { LiveRoomPort } from '../../live-room-port/index.js'
import { locked } from './invites-repository.js'

const memberNotFound = () => notFound('member_not_found', 'This user is not a member of the room.')
const lastOwner = () =>
  new AppError('last_owner', 409, 'A room needs at least one owner: make someone else owner first.')

/** Role changes and removals; the owner rows are locked so the last owner can never disappear. */
export function membersService(dataSource: DataSource, live: Pick<LiveRoomPort, 'closeRoomSockets'>) {
  return {
    /** Owner only (checked by the route). */
    async changeRole(roomId: string, userId: string, role: RoomRole): Promise<{ userId: string; role: RoomRole }> {
      await dataSource.transaction(async (em) => {
        const q = locked(em)
        const owners = await q.owners(roomId)
        const member = await q.membership(roomId, userId)
        if (!member) throw memberNotFound()
        if (member.role === 'owner' && role !== 'owner' && owners.length <= 1) throw lastOwner()
        await q.setRole(member.id, role)
      })
      // Open sockets were admitted with the old role; the client reconnects with the new one.
      live.closeRoomSockets(roomId, userId)
      return { userId, role }
    },

    /** The owner may remove anyone; any member may remove themselves (leave the room). */
    async remove(roomId: string, userId: string, actor: { id: string; role: RoomRole }): Promise<void> {
      if (actor.role !== 'owner' && actor.id !== userId) throw forbidden('Only an owner can remove other members.')
      await dataSource.transaction(async (em) => {
        const q = locked(em)
        const owners = await q.owners(roomId)
        const member = await q.membership(roomId, userId)
        if (!member) throw memberNotFound()
        if (member.role === 'owner' && owners.length <= 1) throw lastOwner()
        await q.deleteMembership(member.id)
      })
      live.closeRoomSockets(roomId, userId)
    },
  }
}
