import { Router, type RequestHandler } from 'express'
import type { DataSource } from 'typeorm'
import { z } from 'zod'
import { notFound } from '../lib/app-error.js'
import { requireUser } from '../modules/rooms/room-access.js'
import { dbMailbox } from './mailbox.js'

const query = z.object({
  limit: z.coerce.number().int().min(1).max(500).default(100),
})

/**
 * GET /api/dev/mailbox → { messages: [{ id, to, subject, text, html?, date }] }, newest first: only
 * mail addressed to the signed-in user (401 signed out), since an invite mail's link is a key to a
 * room. Answers 404 in production, signed in or not.
 */
export function devMailboxRoutes({ dataSource, production }: { dataSource: DataSource; production: boolean }): Router {
  const router = Router()
  const mailbox = production ? null : dbMailbox(dataSource)
  const outsideProduction: RequestHandler = (_req, _res, next) => {
    if (!mailbox) throw notFound('not_found', 'The dev mailbox exists only outside production.')
    next()
  }
  router.get('/mailbox', outsideProduction, requireUser, async (req, res) => {
    const { limit } = query.parse(req.query)
    res.json({ messages: await mailbox!.listTo(req.user!.email, limit) })
  })
  return router
}
