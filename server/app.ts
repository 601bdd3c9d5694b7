import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import { csrfSync } from 'csrf-sync'
import express, { type Express, type RequestHandler } from 'express'
import helmet from 'helmet'
import type { DataSource } from 'typeorm'
import type { Config } from './config.js'
import { apiNotFound, errorHandler } from './lib/error-handler.js'
import { jsonDepthLimit } from './lib/json-depth.js'
import { createPassport } from './modules/auth/auth-passport.js'
import { authRoutes } from './modules/auth/auth-routes.js'
import { authService } from './modules/auth/auth-service.js'
import { roomsRoutes } from './modules/rooms/rooms-routes.js'
import { roomsService } from './modules/rooms/rooms-service.js'
import { teamworkRoutes } from './modules/invites/teamwork-routes.js'
import { offlineLiveRoom, type LiveRoomPort } from './live-room-port/index.js'
import { announceRoomWrites, roomWrites, type RoomWrites } from './modules/activity/room-writes.js'
import { createSession } from './session.js'

export interface AppDeps {
  config: Config
  /** An initialised DataSource with migrations already run. */
  dataSource: DataSource
  /** Folder with the Vite build; served with SPA fallback when it exists. */
  distDir?: string
  /** Session and passport, built first so the realtime layer can use them too (createWebSession). */
  web?: WebSession
  /** The live room the routes use; without one, reads answer 503 'live_unavailable'. */
  live?: LiveRoomPort
  /** The express app to configure (main.ts hands in the one its http server already serves). */
  app?: Express
  /** State of the Redis link in scale-out (REDIS_URL); absent in one process. */
  redisState?: () => 'up' | 'down'
}

/** express-session, passport and the auth service: what both the routes and the sockets need. */
export interface WebSession {
  sessionMiddleware: RequestHandler
  /** passport's session middleware (sets req.user from the session). */
  passportSession: RequestHandler
  passport: ReturnType<typeof createPassport>
  auth: ReturnType<typeof authService>
  close: () => Promise<void>
}

/** Builds the session store, the auth service and passport once, for the app and the sockets. */
export function createWebSession(config: Config, dataSource: DataSource): WebSession {
  const session = createSession(config, dataSource)
  const auth = authService(dataSource, config.BCRYPT_COST)
  const passport = createPassport(auth)
  return {
    sessionMiddleware: session.middleware,
    passportSession: passport.session() as RequestHandler,
    passport,
    auth,
    close: session.close,
  }
}

export interface AppBundle {
  app: Express
  /** express-session middleware, for authenticating websocket upgrades and socket.io. */
  sessionMiddleware: RequestHandler
  /** passport's session middleware (sets req.user from the session) for the same purpose. */
  passportSession: RequestHandler
  /** Mount extra /api routers here before the 404 and error handlers (e.g. snapshots, pins). */
  api: express.Router
  /** Successful writes under /api/rooms/:id, by room (the rooms list's live updates listen). */
  writes: RoomWrites
  close: () => Promise<void>
}

/** Builds the Express app without listening, so tests and main.ts can attach it to any server. */
export function createApp({
  config,
  dataSource,
  distDir = resolve(import.meta.dirname, '../dist'),
  web = createWebSession(config, dataSource),
  live = offlineLiveRoom(),
  app = express(),
  redisState,
}: AppDeps): AppBundle {
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

  const { auth, passport, passportSession } = web
  const { csrfSynchronisedProtection, generateToken } = csrfSync({
    getTokenFromRequest: (req) => req.get('x-csrf-token'),
  })

  const api = express.Router()
  api.use(express.json({ limit: '1mb' }), jsonDepthLimit())
  // Before the session, which itself needs the database.
  // The proxy's health check in scale-out names the instance and its links.
  api.get('/health', async (_req, res) => {
    const db = await dataSource.query('SELECT 1').then(
      () => 'up' as const,
      () => 'down' as const,
    )
    const redis = redisState ? redisState() : 'off'
    const ok = db === 'up' && redis !== 'down'
    // 503 only without the database: with Redis down an instance still serves its own clients and
    // the API, and taking every instance out of the proxy at once would turn a pause into an outage.
    res.status(db === 'up' ? 200 : 503).json({ ok, db, redis, instance: config.INSTANCE_ID })
  })
  api.use(web.sessionMiddleware, passport.initialize(), passportSession)
  api.use(csrfSynchronisedProtection)
  const writes = roomWrites()
  api.use(announceRoomWrites(writes))
  api.use(
    '/auth',
    authRoutes({
      auth,
      passport,
      csrfToken: (req) => generateToken(req),
      onSignOut: (userId) => live.closeRoomSockets(undefined, userId),
      limits: { signUpsPerHour: config.RATE_SIGNUPS_PER_HOUR, signInFailuresPerIp: config.RATE_SIGNIN_FAILURES_PER_IP },
    }),
  )
  api.use(
    '/rooms',
    roomsRoutes(dataSource, roomsService(dataSource), live, { roomsPerHour: config.RATE_ROOMS_PER_HOUR }),
  )
  api.use(teamworkRoutes({ config, dataSource, live }))
  app.use('/api', api)
  // Routers added to `api` later still run before these: they live inside the mounted router.
  app.use('/api', apiNotFound)
  if (existsSync(resolve(distDir, 'index.html'))) {
    app.use(express.static(distDir, { index: false, maxAge: '1h' }))
    app.get('/{*path}', (_req, res) => res.sendFile(resolve(distDir, 'index.html')))
  }
  app.use(errorHandler)

  return { app, sessionMiddleware: web.sessionMiddleware, passportSession, api, writes, close: web.close }
}
