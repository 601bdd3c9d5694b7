import { Router } from 'express'
import type { DataSource } from 'typeorm'
import { AppError } from '../../lib/app-error.js'
import { HOUR_MS, limiter } from '../../lib/rate-limits.js'
import { requireRoomAction, requireUser, roomRole } from '../rooms/room-access.js'
import type { InvitesService } from './invites-service.js'
import { createInviteBody, inviteToken, memberRoleBody, uuidParam } from './invites-schema.js'
import type { membersService } from './members-service.js'

const parseToken = (raw: unknown): string => {
  const r = inviteToken.safeParse(raw)
  if (!r.success)
    throw new AppError('invite_not_found', 404, 'This invite link is not valid: check that the whole link was copied.')
  return r.data
}
const parseId = (raw: unknown, code: string, what: string): string => {
  const r = uuidParam.safeParse(raw)
  if (!r.success) throw new AppError(code, 404, `No such ${what}.`)
  return r.data.toLowerCase()
}

/** Invites (/api/rooms/:id/invites, /api/invites/:token) and member roles (/api/rooms/:id/members/:userId). */
export function invitesRoutes(
  dataSource: DataSource,
  invites: InvitesService,
  members: ReturnType<typeof membersService>,
  limits: { invitesPerHour: number },
): Router {
  const router = Router()
  const owner = requireRoomAction(dataSource, 'manageMembers')
  const viewer = requireRoomAction(dataSource, 'read')
  // Every invite sends an e-mail from our address: counted per inviting user, over all their rooms.
  const inviteLimiter = limiter({ what: 'invites sent', windowMs: HOUR_MS, limit: limits.invitesPerHour, key: 'user' })

  router.post('/rooms/:id/invites', owner, inviteLimiter, async (req, res) => {
    const body = createInviteBody.parse(req.body)
    const invite = await invites.create(req.params.id as string, body, req.user!)
    res.status(201).json({ invite })
  })

  router.get('/rooms/:id/invites', owner, async (req, res) => {
    res.json({ invites: await invites.listPending(req.params.id as string) })
  })

  router.delete('/rooms/:id/invites/:inviteId', owner, async (req, res) => {
    await invites.revoke(
      req.params.id as string,
      parseId(req.params.inviteId, 'invite_not_found', 'invite in this room'),
    )
    res.status(204).end()
  })

  router.get('/invites/:token', async (req, res) => {
    res.json({ invite: await invites.preview(parseToken(req.params.token)) })
  })

  router.post('/invites/:token/accept', requireUser, async (req, res) => {
    res.json(await invites.accept(parseToken(req.params.token), req.user!))
  })

  router.patch('/rooms/:id/members/:userId', owner, async (req, res) => {
    const { role } = memberRoleBody.parse(req.body)
    const userId = parseId(req.params.userId, 'member_not_found', 'member in this room')
    res.json({ member: await members.changeRole(req.params.id as string, userId, role) })
  })

  // Any member may call this; the service allows only owners or the member themselves.
  router.delete('/rooms/:id/members/:userId', viewer, async (req, res) => {
    const userId = parseId(req.params.userId, 'member_not_found', 'member in this room')
    await members.remove(req.params.id as string, userId, { id: req.user!.id, role: roomRole(req) })
    res.status(204).end()
  })

  return router
}
