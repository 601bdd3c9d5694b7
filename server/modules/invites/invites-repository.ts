import { IsNull, MoreThan, type DataSource, type EntityManager } from 'typeorm'
import {
  InviteEntity,
  MembershipEntity,
  RoomEntity,
  UserEntity,
  type Invite,
  type RoomRole,
} from '../../db/entities/index.js'

/** Queries on invites and memberships; every value is a bound parameter. */
export function invitesRepository(dataSource: DataSource) {
  const invites = dataSource.getRepository(InviteEntity)
  return {
    insert: (invite: Omit<Invite, 'createdAt' | 'acceptedAt' | 'revokedAt'>) =>
      invites.insert({ ...invite, acceptedAt: null, revokedAt: null }),
    deleteById: (id: string) => invites.delete({ id }),
    findByHash: (tokenHash: string) =>
      invites.findOne({ where: { tokenHash }, relations: { room: true, invitedBy: true } }),
    findInRoom: (roomId: string, id: string) => invites.findOneBy({ roomId, id }),
    /** Not accepted, not revoked, not expired; newest first. */
    listPending: (roomId: string) =>
      invites.find({
        where: { roomId, acceptedAt: IsNull(), revokedAt: IsNull(), expiresAt: MoreThan(new Date()) },
        relations: { invitedBy: true },
        order: { createdAt: 'DESC' },
      }),
    revoke: (id: string) => invites.update({ id, revokedAt: IsNull() }, { revokedAt: new Date() }),
    roomName: async (roomId: string) =>
      (await dataSource.getRepository(RoomEntity).findOneBy({ id: roomId }))?.name ?? '',
    userByEmail: (email: string) => dataSource.getRepository(UserEntity).findOneBy({ email }),
    membership: (roomId: string, userId: string) =>
      dataSource.getRepository(MembershipEntity).findOneBy({ roomId, userId }),
  }
}

/** Row-locking queries used inside a transaction (accepting an invite, changing members). */
export const locked = (em: EntityManager) => ({
  inviteByHash: (tokenHash: string) =>
    em.getRepository(InviteEntity).findOne({ where: { tokenHash }, lock: { mode: 'pessimistic_write' } }),
  markAccepted: (id: string) => em.getRepository(InviteEntity).update({ id }, { acceptedAt: new Date() }),
  membership: (roomId: string, userId: string) =>
    em.getRepository(MembershipEntity).findOne({ where: { roomId, userId }, lock: { mode: 'pessimistic_write' } }),
  /** Locks every owner row of the room, so two demotions cannot both see "another owner left". */
  owners: (roomId: string) =>
    em.getRepository(MembershipEntity).find({ where: { roomId, role: 'owner' }, lock: { mode: 'pessimistic_write' } }),
  insertMembership: (m: { id: string; roomId: string; userId: string; role: RoomRole }) =>
    em.getRepository(MembershipEntity).insert(m),
  setRole: (id: string, role: RoomRole) => em.getRepository(MembershipEntity).update({ id }, { role }),
  deleteMembership: (id: string) => em.getRepository(MembershipEntity).delete({ id }),
})
