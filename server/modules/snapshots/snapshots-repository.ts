import type { DataSource } from 'typeorm'
import { SnapshotEntity, type Snapshot } from '../../db/entities/index.js'

/** Queries on snapshots. Listing leaves out the frame and the surface blob (they can be large). */
export function snapshotsRepository(dataSource: DataSource) {
  const repo = dataSource.getRepository(SnapshotEntity)
  return {
    // frame and figures are JSON columns typed unknown, which TypeORM's deep-partial type cannot follow.
    insert: (s: Omit<Snapshot, 'createdAt'>) => repo.insert(s as Parameters<typeof repo.insert>[0]),
    list: (roomId: string) =>
      repo
        .createQueryBuilder('s')
        .leftJoinAndSelect('s.author', 'author')
        .select([
          's.id',
          's.roomId',
          's.name',
          's.note',
          's.authorId',
          's.figures',
          's.createdAt',
          'author.id',
          'author.name',
        ])
        .where('s.roomId = :roomId', { roomId })
        .orderBy('s.createdAt', 'DESC')
        .getMany(),
    /** With the frame; the surface blob only when asked for. */
    find: (roomId: string, id: string, withSurface = false) => {
      const qb = repo
        .createQueryBuilder('s')
        .leftJoinAndSelect('s.author', 'author')
        .where('s.roomId = :roomId AND s.id = :id', { roomId, id })
      if (!withSurface)
        qb.select([
          's.id',
          's.roomId',
          's.name',
          's.note',
          's.authorId',
          's.frame',
          's.figures',
          's.pattern',
          's.createdAt',
          'author.id',
          'author.name',
        ])
      return qb.getOne()
    },
    delete: (roomId: string, id: string) => repo.delete({ roomId, id }),
  }
}
