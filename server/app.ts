import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import { csrfSync } from 'csrf-sync'
import express, { type Express, type RequestHandler } from 'express'
import helmet from 'helmet'
import type { DataSource } from 'typeorm'
import type { Config } from './config.js'
import { apiNotFound, errorHandler } from './lib/error-handler.js'
import { createPassport } from './modules/auth/auth-passport.js'
import { authRoutes } from './modules/auth/auth-routes.js'
import { authService } from './modules/auth/auth-service.js'
import { roomsRoutes } from './modules/rooms/rooms-routes.js'
import { roomsService } from './modules/rooms/rooms-service.js'
import { teamworkRoutes } from './modules/invites/teamwork-routes.js'
import { lateRoomLive, type LateRoomLive } from './modules/snapshots/room-live.js'
import { createSession } from './session.js'

export interface AppDeps {
  config: Config
  /** An initialised DataSource with migrations already run. */
  dataSource: DataSource
  /** Folder with the Vite build; served with SPA fallback when it exists. */
  distDir?: string
}

export interface AppBundle {
  app: Express
  /** express-session middleware, for authenticating websocket upgrades and socket.io. */
  sessionMiddleware: RequestHandler
  /** passport's session middleware (sets req.user from the session) for the same purpose. */
  passportSession: RequestHandler
  /** Mount extra /api routers here before the 404 and error handlers (e.g. snapshots, pins). */
  api: express.Router
  /** The team-work routes' view of the live room: attach the realtime accessors once they exist. */
  live: LateRoomLive
  close: () => Promise<void>
}

/** Builds the Express app without listening, so tests and main.ts can attach it to any server. */
export function createApp({ config, dataSource, distDir = resolve(import.meta.dirname, '../dist') }: AppDeps): AppBundle {
  const app = express()
  app.disable('x-powered-by')
  // Behind a TLS-terminating proxy on this machine, so secure cookies and req.ip work.
  if (config.PUBLIC_URL.startsWith('https:')) app.set('trust proxy', 'loopback')

  const https = config.PUBLIC_URL.startsWith('https:')
  app.use(
    helmet({
      strictTransportSecurity: https,
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'script-src': ["'self'"],
          // Naive UI injects its component styles at run time.
          'style-src': ["'self'", "'unsafe-inline'"],
          'connect-src': ["'self'", 'ws:', 'wss:'],
          'worker-src': ["'self'", 'blob:'],
          'img-src': ["'self'", 'data:', 'blob:'],
          'font-src': ["'self'", 'data:'],
          'upgrade-insecure-requests': https ? [] : null,
        },
      },
    }),
  )

  const session = createSession(config, dataSource)
  const auth = authService(dataSource, config.BCRYPT_COST)
  const passport = createPassport(auth)
  const passportSession = passport.session() as RequestHandler
  const { csrfSynchronisedProtection, generateToken } = csrfSync({
    getTokenFromRequest: (req) => req.get('x-csrf-token'),
  })

  const api = express.Router()
  api.use(express.json({ limit: '1mb' }))
  // Before the session, which itself needs the database.
  api.get('/health', async (_req, res) => {
    try {
      await dataSource.query('SELECT 1')
      res.json({ ok: true, db: 'up' })
    } catch {
      res.status(503).json({ ok: false, db: 'down' })
    }
  })
  api.use(session.middleware, passport.initialize(), passportSession)
  api.use(csrfSynchronisedProtection)
  const live = lateRoomLive()
  api.use(
    '/auth',
    authRoutes({ auth, passport, csrfToken: (req) => generateToken(req), onSignOut: (userId) => live.closeRoomSockets(undefined, userId) }),
  )
  api.use('/rooms', roomsRoutes(dataSource, roomsService(dataSource), live))
  api.use(teamworkRoutes({ config, dataSource, live }))
  app.use('/api', api)
  // Routers added to `api` later still run before these: they live inside the mounted router.
  app.use('/api', apiNotFound)
  if (existsSync(resolve(distDir, 'index.html'))) {
    app.use(express.static(distDir, { index: false, maxAge: '1h' }))
    app.get('/{*path}', (_req, res) => res.sendFile(resolve(distDir, 'index.html')))
  }
  app.use(errorHandler)

  return { app, sessionMiddleware: session.middleware, passportSession, api, live, close: session.close }
}
