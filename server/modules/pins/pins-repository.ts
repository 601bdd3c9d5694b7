import { In, type DataSource } from 'typeorm'
import { PinEntity, PinReplyEntity, type Pin, type PinReply } from '../../db/entities/index.js'

export interface PinRow extends Pin {
  /** pins.updated_at (added by the team-work migration; not on the Pin entity). */
  updatedAt: Date
  replies: PinReply[]
}

/** Queries on pins and their replies. */
export function pinsRepository(dataSource: DataSource) {
  const pins = dataSource.getRepository(PinEntity)
  const replies = dataSource.getRepository(PinReplyEntity)

  async function list(
    roomId: string,
    filter: { resolved?: boolean; authorId?: string; pinId?: string },
  ): Promise<PinRow[]> {
    const qb = pins
      .createQueryBuilder('pin')
      .leftJoinAndSelect('pin.author', 'author')
      .addSelect('pin.updated_at', 'pin_updated_at')
      .where('pin.roomId = :roomId', { roomId })
      .orderBy('pin.createdAt', 'ASC')
    if (filter.resolved !== undefined) qb.andWhere('pin.resolved = :resolved', { resolved: filter.resolved })
    if (filter.authorId) qb.andWhere('pin.authorId = :authorId', { authorId: filter.authorId })
    if (filter.pinId) qb.andWhere('pin.id = :pinId', { pinId: filter.pinId })
    const { entities, raw } = await qb.getRawAndEntities<{ pin_id: string; pin_updated_at: Date }>()
    const updated = new Map(raw.map((r) => [r.pin_id, new Date(r.pin_updated_at)]))
    const allReplies = entities.length
      ? await replies.find({
          where: { pinId: In(entities.map((p) => p.id)) },
          relations: { author: true },
          order: { createdAt: 'ASC' },
        })
      : []
    return entities.map((p) => ({
      ...p,
      updatedAt: updated.get(p.id) ?? p.createdAt,
      replies: allReplies.filter((r) => r.pinId === p.id),
    }))
  }

  return {
    list,
    findOne: async (roomId: string, pinId: string) => (await list(roomId, { pinId }))[0] ?? null,
    insert: (pin: Omit<Pin, 'createdAt' | 'resolved'>) => pins.insert({ ...pin, resolved: false }),
    update: (pinId: string, patch: Partial<Pick<Pin, 'body' | 'resolved'>>) => pins.update({ id: pinId }, patch),
    delete: (pinId: string) => pins.delete({ id: pinId }),
    insertReply: (reply: Omit<PinReply, 'createdAt'>) => replies.insert(reply),
    /** A reply changes the pin's thread, so the pin counts as updated. */
    touch: (pinId: string) =>
      dataSource.query('UPDATE pins SET updated_at = CURRENT_TIMESTAMP(3) WHERE id = ?', [pinId]),
  }
}
