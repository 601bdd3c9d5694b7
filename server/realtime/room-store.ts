/**
 * The database side of a live room document: load (compacted state + pending updates in order),
 * append one accepted update, and compact. Plain SQL with bound parameters: `update` is a reserved
 * word and the upsert/delete pair must run in one transaction.
 */
import type { DataSource } from 'typeorm'

export interface StoredRoom {
  /** Merged V1 update of the compacted document, or null for a room that never had one. */
  state: Buffer | null
  /** The newest version stored, by the state or by a pending row. */
  version: number
  /** Pending V1 updates, oldest first. */
  updates: Buffer[]
  /** Id of the newest pending row (compaction deletes up to it), or 0. */
  lastUpdateId: number
  /** Ids of the pending rows, oldest first. */
  ids: number[]
}

interface StateRow {
  state: Buffer
  version: number
}

interface UpdateRow {
  id: string | number
  update: Buffer
  version: number
}

/** Reads a room's compacted state and the updates stored after it. */
export async function loadStoredRoom(ds: DataSource, roomId: string): Promise<StoredRoom> {
  const states = (await ds.query('SELECT `state`, `version` FROM `room_documents` WHERE `room_id` = ?', [
    roomId,
  ])) as StateRow[]
  const rows = (await ds.query(
    'SELECT `id`, `update`, `version` FROM `room_updates` WHERE `room_id` = ? ORDER BY `id`',
    [roomId],
  )) as UpdateRow[]
  const head = states[0]
  const last = rows[rows.length - 1]
  return {
    state: head ? head.state : null,
    version: Math.max(head ? Number(head.version) : 0, last ? Number(last.version) : 0),
    updates: rows.map((r) => r.update),
    lastUpdateId: last ? Number(last.id) : 0,
    ids: rows.map((r) => Number(r.id)),
  }
}

/**
 * Appends accepted updates in one statement, oldest first; returns the newest row id. Ids of one
 * multi-row insert are consecutive (InnoDB's default auto-increment lock mode); compaction only
 * relies on every earlier row of this room having a smaller id, which holds in any mode because a
 * room's writes run one after another.
 */
export async function appendUpdates(
  ds: DataSource,
  roomId: string,
  rows: readonly { update: Uint8Array; version: number }[],
): Promise<number> {
  const values = rows.map(() => '(?, ?, ?)').join(', ')
  const params = rows.flatMap(({ update, version }) => [
    roomId,
    Buffer.from(update.buffer, update.byteOffset, update.byteLength),
    version,
  ])
  const result = (await ds.query(
    `INSERT INTO \`room_updates\` (\`room_id\`, \`update\`, \`version\`) VALUES ${values}`,
    params,
  )) as { insertId: number; affectedRows: number }
  return Number(result.insertId) + rows.length - 1
}

/**
 * Stores the full document state with its version and deletes the update rows it already contains
 * (ids ≤ upToId). Rows appended meanwhile stay and are re-applied on load; yjs ignores duplicates.
 */
export async function storeCompacted(
  ds: DataSource,
  roomId: string,
  state: Uint8Array,
  version: number,
  upToId: number,
): Promise<void> {
  // InnoDB may still pick this transaction as a deadlock victim when many rooms compact at once
  // (everyone leaving together); the documented remedy is to run it again.
  for (let attempt = 1; ; attempt++) {
    try {
      return await compactOnce(ds, roomId, state, version, upToId)
    } catch (err) {
      if (attempt >= 3 || (err as { driverError?: { errno?: number } }).driverError?.errno !== 1213) throw err
    }
  }
}

async function compactOnce(
  ds: DataSource,
  roomId: string,
  state: Uint8Array,
  version: number,
  upToId: number,
): Promise<void> {
  // READ COMMITTED: the range delete takes no gap locks, which deadlocked against other rooms'
  // inserts into the same index under REPEATABLE READ.
  await ds.transaction('READ COMMITTED', async (em) => {
    await em.query(
      'INSERT INTO `room_documents` (`room_id`, `state`, `version`, `updated_at`) VALUES (?, ?, ?, NOW(3)) ' +
        'ON DUPLICATE KEY UPDATE `state` = VALUES(`state`), `version` = VALUES(`version`), `updated_at` = NOW(3)',
      [roomId, Buffer.from(state.buffer, state.byteOffset, state.byteLength), version],
    )
    if (upToId > 0) await em.query('DELETE FROM `room_updates` WHERE `room_id` = ? AND `id` <= ?', [roomId, upToId])
  })
}

/**
 * Compaction when several instances hold the room (scale-out): the stored state is read under a
 * row lock and handed to `merge`, which folds it into the live document and returns the state to
 * write; only the update rows listed in `ids` (those the document is known to contain) are deleted.
 * Rows another instance stored meanwhile stay and are re-applied on load (yjs ignores duplicates).
 */
export async function storeCompactedShared(
  ds: DataSource,
  roomId: string,
  merge: (stored: Buffer | null) => Uint8Array,
  version: number,
  ids: readonly number[],
): Promise<void> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await ds.transaction('READ COMMITTED', async (em) => {
        const rows = (await em.query('SELECT `state`, `version` FROM `room_documents` WHERE `room_id` = ? FOR UPDATE', [
          roomId,
        ])) as StateRow[]
        const state = merge(rows[0]?.state ?? null)
        const newest = Math.max(version, rows[0] ? Number(rows[0].version) : 0)
        await em.query(
          'INSERT INTO `room_documents` (`room_id`, `state`, `version`, `updated_at`) VALUES (?, ?, ?, NOW(3)) ' +
            'ON DUPLICATE KEY UPDATE `state` = VALUES(`state`), `version` = VALUES(`version`), `updated_at` = NOW(3)',
          [roomId, Buffer.from(state.buffer, state.byteOffset, state.byteLength), newest],
        )
        for (let i = 0; i < ids.length; i += 500) {
          const chunk = ids.slice(i, i + 500)
          await em.query(
            `DELETE FROM \`room_updates\` WHERE \`room_id\` = ? AND \`id\` IN (${chunk.map(() => '?').join(', ')})`,
            [roomId, ...chunk],
          )
        }
      })
    } catch (err) {
      if (attempt >= 3 || (err as { driverError?: { errno?: number } }).driverError?.errno !== 1213) throw err
    }
  }
}
