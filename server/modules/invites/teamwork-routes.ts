import { Router } from 'express'
import type { DataSource } from 'typeorm'
import type { Config } from '../../config.js'
import { devMailboxRoutes } from '../../mail/dev-mailbox-routes.js'
import { loadMailConfig, type MailConfig } from '../../mail/mail-config.js'
import { createMailer } from '../../mail/mailer.js'
import { filesRoutes } from '../files/files-routes.js'
import { pinsRoutes } from '../pins/pins-routes.js'
import { pinsService } from '../pins/pins-service.js'
import type { LiveRoomPort } from '../../live-room-port/index.js'
import { snapshotsRoutes } from '../snapshots/snapshots-routes.js'
import { snapshotsService } from '../snapshots/snapshots-service.js'
import { invitesRoutes } from './invites-routes.js'
import { invitesService } from './invites-service.js'
import { membersService } from './members-service.js'

export interface TeamworkDeps {
  config: Pick<Config, 'PUBLIC_URL' | 'NODE_ENV' | 'RATE_INVITES_PER_HOUR'>
  dataSource: DataSource
  /** The live room (server/realtime): frames, surfaces, room broadcasts, closing sockets. */
  live: LiveRoomPort
  /** Defaults to SMTP_* from the environment. */
  mail?: MailConfig
}

/**
 * Everything a team does around a room: invites and members, pins, snapshots, files, and the dev
 * mailbox. Mount on the /api router (after the session, passport and CSRF middleware).
 */
export function teamworkRoutes({ config, dataSource, live, mail = loadMailConfig() }: TeamworkDeps): Router {
  const router = Router()
  const mailer = createMailer(mail)
  const invites = invitesService({ dataSource, mailer, publicUrl: config.PUBLIC_URL })
  router.use(
    invitesRoutes(dataSource, invites, membersService(dataSource, live), {
      invitesPerHour: config.RATE_INVITES_PER_HOUR,
    }),
  )
  router.use(pinsRoutes(dataSource, pinsService(dataSource, live)))
  const snapshots = snapshotsService(dataSource, live)
  router.use(snapshotsRoutes(dataSource, snapshots))
  router.use(filesRoutes(dataSource, live, snapshots))
  router.use('/dev', devMailboxRoutes({ dataSource, production: config.NODE_ENV === 'production' }))
  return router
}
