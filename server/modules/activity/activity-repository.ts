import type { DataSource } from 'typeorm'

/** The latest change in a room: when, by whom (null: a former member or nobody), what. */
export interface LastChange {
  at: Date
  by: string | null
  what: string
}

export interface RoomActivityRow {
  lastChange: LastChange | null
  openPins: number
  /** Open pins I started or replied to. */
  myOpenPins: number
  solveState: 'settled' | 'unsettled' | null
  solveReason: string | null
  thumbnailAt: Date | null
}

// The latest of: a stored frame edit, a snapshot, a pin, a reply, a member joining. Derived at
// read time from the tables that already hold each event, so nothing writes per drag.
const lastChangeSql = `
  SELECT x.room_id, x.at, x.what, u.name AS by_name FROM (
    SELECT y.*, ROW_NUMBER() OVER (PARTITION BY y.room_id ORDER BY y.at DESC) AS rn FROM (
      SELECT room_id, edit_at AS at, edit_user_id AS user_id, edit_summary AS what
        FROM room_activity WHERE room_id IN (?) AND edit_at IS NOT NULL
      UNION ALL SELECT room_id, created_at, author_id, CONCAT('saved the snapshot “', name, '”')
        FROM snapshots WHERE room_id IN (?)
      UNION ALL SELECT room_id, created_at, author_id, 'pinned a comment' FROM pins WHERE room_id IN (?)
      UNION ALL SELECT p.room_id, r.created_at, r.author_id, 'replied to a pin'
        FROM pin_replies r JOIN pins p ON p.id = r.pin_id WHERE p.room_id IN (?)
      UNION ALL SELECT m.room_id, m.created_at, m.user_id,
          IF(m.created_at = (SELECT MIN(m2.created_at) FROM memberships m2 WHERE m2.room_id = m.room_id), 'created the room', 'joined the room')
        FROM memberships m WHERE m.room_id IN (?)
    ) y
  ) x LEFT JOIN users u ON u.id = x.user_id WHERE x.rn = 1`

const pinsSql = `
  SELECT p.room_id, COUNT(*) AS open_pins,
         SUM(p.author_id = ? OR EXISTS (SELECT 1 FROM pin_replies r WHERE r.pin_id = p.id AND r.author_id = ?)) AS mine
  FROM pins p WHERE p.room_id IN (?) AND p.resolved = 0 GROUP BY p.room_id`

export function activityRepository(ds: DataSource) {
  return {
    /** Activity of each room in `roomIds` as `userId` sees it. */
    async forRooms(roomIds: readonly string[], userId: string): Promise<Map<string, RoomActivityRow>> {
      const out = new Map<string, RoomActivityRow>()
      if (roomIds.length === 0) return out
      const ids = [...roomIds]
      const [changes, pins, solves] = await Promise.all([
        ds.query(lastChangeSql, [ids, ids, ids, ids, ids]) as Promise<
          { room_id: string; at: Date; what: string; by_name: string | null }[]
        >,
        ds.query(pinsSql, [userId, userId, ids]) as Promise<
          { room_id: string; open_pins: string | number; mine: string | number | null }[]
        >,
        ds.query('SELECT room_id, solve_state, solve_reason, thumbnail_at FROM room_activity WHERE room_id IN (?)', [
          ids,
        ]) as Promise<
          { room_id: string; solve_state: string | null; solve_reason: string | null; thumbnail_at: Date | null }[]
        >,
      ])
      for (const id of ids)
        out.set(id, {
          lastChange: null,
          openPins: 0,
          myOpenPins: 0,
          solveState: null,
          solveReason: null,
          thumbnailAt: null,
        })
      for (const c of changes) out.get(c.room_id)!.lastChange = { at: c.at, by: c.by_name, what: c.what }
      for (const p of pins)
        Object.assign(out.get(p.room_id)!, { openPins: Number(p.open_pins), myOpenPins: Number(p.mine ?? 0) })
      for (const s of solves) {
        const state = s.solve_state === 'settled' || s.solve_state === 'unsettled' ? s.solve_state : null
        Object.assign(out.get(s.room_id)!, {
          solveState: state,
          solveReason: s.solve_reason,
          thumbnailAt: s.thumbnail_at,
        })
      }
      return out
    },
    recordEdit: (roomId: string, userId: string, summary: string, at: Date) =>
      ds.query(
        `INSERT INTO room_activity (room_id, edit_user_id, edit_summary, edit_at) VALUES (?, ?, ?, ?)
         ON DUPLICATE KEY UPDATE edit_user_id = VALUES(edit_user_id), edit_summary = VALUES(edit_summary), edit_at = VALUES(edit_at)`,
        [roomId, userId, summary.slice(0, 160), at],
      ),
    recordSolve: (
      roomId: string,
      state: 'settled' | 'unsettled',
      reason: string | null,
      thumbnail: Buffer | null,
      at: Date,
    ) =>
      ds.query(
        `INSERT INTO room_activity (room_id, solve_state, solve_reason, solved_at, thumbnail, thumbnail_at) VALUES (?, ?, ?, ?, ?, ?)
         ON DUPLICATE KEY UPDATE solve_state = VALUES(solve_state), solve_reason = VALUES(solve_reason), solved_at = VALUES(solved_at),
           thumbnail = COALESCE(VALUES(thumbnail), thumbnail), thumbnail_at = COALESCE(VALUES(thumbnail_at), thumbnail_at)`,
        [roomId, state, reason, at, thumbnail, thumbnail ? at : null],
      ),
    async thumbnail(roomId: string): Promise<Buffer | null> {
      const rows: { thumbnail: Buffer | null }[] = await ds.query(
        'SELECT thumbnail FROM room_activity WHERE room_id = ?',
        [roomId],
      )
      return rows[0]?.thumbnail ?? null
    },
  }
}

export type ActivityRepository = ReturnType<typeof activityRepository>
