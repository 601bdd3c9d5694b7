import { Router } from 'express'
import type { DataSource } from 'typeorm'
import { z } from 'zod'
import { notFound } from '../lib/app-error.js'
import { dbMailbox } from './mailbox.js'

const query = z.object({
  to: z.string().max(254).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
})

/**
 * GET /api/dev/mailbox → { messages: [{ id, to, subject, text, html?, date }] }, newest first,
 * optionally only those sent to `?to=`. Answers 404 in production: mail may hold invite tokens.
 */
export function devMailboxRoutes({ dataSource, production }: { dataSource: DataSource; production: boolean }): Router {
  const router = Router()
  const mailbox = production ? null : dbMailbox(dataSource)
  router.get('/mailbox', async (req, res) => {
    if (!mailbox) throw notFound('not_found', 'The dev mailbox exists only outside production.')
    const { to, limit } = query.parse(req.query)
    const all = await mailbox.list(to ? 500 : limit)
    const wanted = to ? to.trim().toLowerCase() : null
    const messages = wanted ? all.filter((m) => m.to.toLowerCase().split(', ').includes(wanted)).slice(0, limit) : all
    res.json({ messages })
  })
  return router
}
