import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MembershipEntity, UserEntity } from '../../server/db/entities/index.js'
import { demoAccounts, demoRooms, seedDemo } from '../../server/db/seed.js'
import type { Running } from '../../server/main.js'
import { ApiClient, startTestServer } from '../helpers/test-server.js'

let server: Running
beforeAll(async () => {
  server = await startTestServer()
})
afterAll(async () => {
  await server?.stop()
})

describe('demo seed', () => {
  it('is idempotent: a second run finds the same rooms and adds no users or members', async () => {
    const first = await seedDemo(server.dataSource, 10)
    const second = await seedDemo(server.dataSource, 10)
    expect(second).toEqual(first)
    const emails = demoAccounts.map((a) => a.email)
    const users = await server.dataSource.getRepository(UserEntity).find()
    expect(users.filter((u) => emails.includes(u.email as (typeof emails)[number]))).toHaveLength(3)
    for (const roomId of Object.values(first)) {
      const members = await server.dataSource.getRepository(MembershipEntity).findBy({ roomId })
      expect(members.map((m) => m.role).sort()).toEqual(['editor', 'owner', 'reviewer'])
    }
  })

  it.each(demoAccounts)(
    '$email signs in with the printed password and sees both demo rooms as $role',
    async (account) => {
      const c = new ApiClient(server.url)
      expect((await c.post('/api/auth/signin', { email: account.email, password: account.password })).status).toBe(200)
      const { rooms } = (await c.get('/api/rooms')).body as { rooms: { name: string; role: string }[] }
      for (const demo of demoRooms)
        expect(rooms).toContainEqual(expect.objectContaining({ name: demo.name, role: account.role }))
    },
  )
})
