import { randomUUID } from 'node:crypto'
import bcrypt from 'bcryptjs'
import type { DataSource } from 'typeorm'
import { logger } from '../lib/logger.js'
import { BCRYPT_COST } from '../modules/auth/auth-service.js'
import { MembershipEntity, RoomEntity, UserEntity, type RoomRole } from './entities/index.js'

// Demo data for a fictional practice, Demo Tensile Studio. The passwords are printed by
// `npm start` and used by the browser tests; they guard nothing but demo rooms on a dev machine.
export const DEMO_PRACTICE = 'Demo Tensile Studio'

export const demoAccounts = [
  { email: 'owner@demo.veilroom.test', name: 'Demo Owner', password: 'demo-owner-canopy', role: 'owner' },
  { email: 'editor@demo.veilroom.test', name: 'Demo Editor', password: 'demo-editor-sail', role: 'editor' },
  { email: 'reviewer@demo.veilroom.test', name: 'Demo Reviewer', password: 'demo-reviewer-check', role: 'reviewer' },
] as const satisfies readonly { email: string; name: string; password: string; role: RoomRole }[]

export const demoRooms = [
  {
    key: 'courtyard',
    name: 'Courtyard canopy — Example Yard A',
    description: `${DEMO_PRACTICE}: a canopy over an invented courtyard, hung from four walls and one central mast.`,
  },
  {
    key: 'shade-sail',
    name: 'Four-point shade sail — Example Terrace B',
    description: `${DEMO_PRACTICE}: a hypar shade sail over an invented terrace, two high and two low corners on edge cables.`,
  },
] as const

export type DemoRoomKey = (typeof demoRooms)[number]['key']

/**
 * Inserts the demo users and rooms if missing (safe to run at every start). Returns the room ids
 * by key so later steps (e.g. storing a demo frame in the room document) can find them.
 */
export async function seedDemo(dataSource: DataSource, bcryptCost = BCRYPT_COST): Promise<Record<DemoRoomKey, string>> {
  return dataSource.transaction(async (em) => {
    const users = em.getRepository(UserEntity)
    const rooms = em.getRepository(RoomEntity)
    const memberships = em.getRepository(MembershipEntity)

    const userIds: string[] = []
    for (const account of demoAccounts) {
      const found = await users.findOneBy({ email: account.email })
      if (found) {
        userIds.push(found.id)
        continue
      }
      const id = randomUUID()
      const passwordHash = await bcrypt.hash(account.password, bcryptCost)
      await users.insert({ id, email: account.email, name: account.name, passwordHash })
      userIds.push(id)
    }

    const ids = {} as Record<DemoRoomKey, string>
    const ownerId = userIds[0] as string
    for (const demo of demoRooms) {
      const existing: { id: string }[] = await em.query(
        `SELECT r.id FROM rooms r JOIN memberships m ON m.room_id = r.id AND m.user_id = ? AND m.role = 'owner'
         WHERE r.name = ? LIMIT 1`,
        [ownerId, demo.name],
      )
      const roomId = existing[0]?.id ?? randomUUID()
      if (!existing[0]) await rooms.insert({ id: roomId, name: demo.name, description: demo.description })
      for (const [i, account] of demoAccounts.entries()) {
        const userId = userIds[i] as string
        if (!(await memberships.findOneBy({ roomId, userId }))) {
          await memberships.insert({ id: randomUUID(), roomId, userId, role: account.role })
        }
      }
      ids[demo.key] = roomId
    }
    logger.info('demo data ready', { practice: DEMO_PRACTICE, rooms: Object.keys(ids).length })
    return ids
  })
}
