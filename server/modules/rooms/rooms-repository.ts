import type { DataSource, EntityManager } from 'typeorm'
import { MembershipEntity, RoomEntity, type Room, type RoomRole } from '../../db/entities/index.js'

/** A room as one member sees it. */
export interface RoomView {
  id: string
  name: string
  description: string
  role: RoomRole
  memberCount: number
  createdAt: Date
  updatedAt: Date
}

export interface MemberView {
  userId: string
  name: string
  email: string
  role: RoomRole
}

interface RoomRow {
  id: string
  name: string
  description: string
  role: RoomRole
  member_count: string | number
  created_at: Date
  updated_at: Date
}

// Parameters are bound (?), never pasted into the SQL text.
const roomViewSql = `
  SELECT r.id, r.name, r.description, m.role, r.created_at, r.updated_at,
         (SELECT COUNT(*) FROM memberships mc WHERE mc.room_id = r.id) AS member_count
  FROM rooms r JOIN memberships m ON m.room_id = r.id AND m.user_id = ?`

const toView = (r: RoomRow): RoomView => ({
  id: r.id,
  name: r.name,
  description: r.description,
  role: r.role,
  memberCount: Number(r.member_count),
  createdAt: r.created_at,
  updatedAt: r.updated_at,
})

export function roomsRepository(dataSource: DataSource) {
  return {
    async listForUser(userId: string): Promise<RoomView[]> {
      const rows: RoomRow[] = await dataSource.query(`${roomViewSql} ORDER BY r.updated_at DESC, r.name`, [userId])
      return rows.map(toView)
    },
    async findForUser(roomId: string, userId: string): Promise<RoomView | null> {
      const rows: RoomRow[] = await dataSource.query(`${roomViewSql} WHERE r.id = ?`, [userId, roomId])
      return rows[0] ? toView(rows[0]) : null
    },
    /** Inserts a room and its first member inside the caller's transaction. */
    async insertWithMember(
      em: EntityManager,
      room: Omit<Room, 'createdAt' | 'updatedAt'>,
      member: { id: string; userId: string; role: RoomRole },
    ) {
      await em.getRepository(RoomEntity).insert(room)
      await em
        .getRepository(MembershipEntity)
        .insert({ id: member.id, roomId: room.id, userId: member.userId, role: member.role })
    },
    async update(roomId: string, patch: Partial<Pick<Room, 'name' | 'description'>>): Promise<void> {
      await dataSource.getRepository(RoomEntity).update({ id: roomId }, patch)
    },
    async delete(roomId: string): Promise<void> {
      await dataSource.getRepository(RoomEntity).delete({ id: roomId })
    },
    async members(roomId: string): Promise<MemberView[]> {
      const rows: MemberView[] = await dataSource.query(
        `SELECT u.id AS userId, u.name, u.email, m.role FROM memberships m JOIN users u ON u.id = m.user_id
         WHERE m.room_id = ? ORDER BY FIELD(m.role, 'owner', 'editor', 'reviewer', 'viewer'), u.name`,
        [roomId],
      )
      return rows.map((r) => ({ userId: r.userId, name: r.name, email: r.email, role: r.role }))
    },
  }
}

export type RoomsRepository = ReturnType<typeof roomsRepository>
