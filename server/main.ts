import { createServer, type Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import type { DataSource } from 'typeorm'
import express from 'express'
import { createApp, createWebSession, type AppBundle } from './app.js'
import { loadConfig, type Config } from './config.js'
import { createDataSource } from './db/data-source.js'
import { seedDemo } from './db/seed.js'
import { logger, setLogLevel } from './lib/logger.js'
import { installProcessGuards } from './lib/process-guards.js'
import type { LiveRoomPort } from './live-room-port/index.js'
import { attachRealtime, type Realtime, type RealtimeDeps } from './realtime/index.js'
import { connectScale } from './scale/index.js'
import { attachActivity, type Activity } from './modules/activity/index.js'

export interface StartOptions {
  /** 0 picks a free port (tests). Defaults to config.PORT. */
  port?: number
  config?: Config
  /** Insert the demo practice, users and rooms (idempotent). */
  seed?: boolean
  /** Realtime tuning (tests and benchmarks). */
  tuning?: RealtimeDeps['tuning']
  /** What the routes see of the live room; tests wrap the real one to record or stand in. */
  live?: (realtime: Realtime) => LiveRoomPort
}

export interface Running extends AppBundle {
  server: Server
  dataSource: DataSource
  config: Config
  port: number
  url: string
  /** The live room: CRDT endpoint, surface stream, solve workers. */
  realtime: Realtime
  /** The rooms list's activity: frame edits, solve outcomes, live `rooms:changed`. */
  activity: Activity
  stop: () => Promise<void>
}

let current: Running | null = null

/**
 * Connects to MariaDB, runs pending migrations, builds the app and listens. The http server is
 * returned (not hidden) so the realtime layer can add its upgrade handler and socket.io.
 */
export async function start(options: StartOptions = {}): Promise<Running> {
  const config = options.config ?? loadConfig()
  setLogLevel(config.LOG_LEVEL)
  installProcessGuards()
  const dataSource = createDataSource(config)
  await dataSource.initialize()
  const ran = await dataSource.runMigrations({ transaction: 'each' })
  if (ran.length) logger.info('migrations applied', { names: ran.map((m) => m.name) })
  const demoRooms = options.seed ? await seedDemo(dataSource, config.BCRYPT_COST) : null

  // The live room first, then the routes that use it: socket.io wraps the server's request
  // listener when it attaches, so the express app is that listener from the start.
  const app = express()
  const server = createServer(app)
  const web = createWebSession(config, dataSource)
  // Scale-out only when asked for: without REDIS_URL this stays one process with no Redis.
  const scale = config.REDIS_URL ? connectScale(config.REDIS_URL, config.INSTANCE_ID) : undefined
  const realtime = attachRealtime(server, { ...web, dataSource, config, tuning: options.tuning, scale })
  const live = options.live ? options.live(realtime) : realtime
  const bundle = createApp({ config, dataSource, web, app, live, redisState: scale?.state })
  const activity = attachActivity({ realtime, dataSource, api: bundle.api, writes: bundle.writes })
  if (demoRooms) {
    await realtime.ensureRoomFrame(demoRooms.courtyard, 'tent')
    await realtime.ensureRoomFrame(demoRooms['shade-sail'], 'sail')
  }
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(options.port ?? config.PORT, config.HOST, () => resolve())
  })
  const port = (server.address() as AddressInfo).port
  const url = `http://${config.HOST}:${port}`

  const running: Running = {
    ...bundle,
    server,
    dataSource,
    config,
    port,
    url,
    realtime,
    activity,
    stop: async () => {
      // Closes the live sockets and solve workers and stores every loaded room document.
      await realtime.close()
      await activity.close()
      server.closeAllConnections()
      await new Promise<void>((resolve) => server.close(() => resolve()))
      await bundle.close()
      await scale?.close()
      await dataSource.destroy()
      if (current === running) current = null
    },
  }
  current = running
  logger.info(
    `Veilroom server listening on ${url}`,
    scale ? { instance: config.INSTANCE_ID, redis: 'shared rooms' } : undefined,
  )
  return running
}

/** Stops the most recently started server (see start()). */
export async function stop(): Promise<void> {
  await current?.stop()
}

// `tsx server/main.ts [--seed]`: run until SIGINT/SIGTERM.
if (import.meta.url === `file://${process.argv[1]}`) {
  try {
    await start({ seed: process.argv.includes('--seed') })
  } catch (err) {
    logger.error(err instanceof Error ? err.message : String(err))
    process.exit(1)
  }
  const shutdown = (signal: string) => {
    logger.info(`${signal}: stopping`)
    stop().then(
      () => process.exit(0),
      () => process.exit(1),
    )
  }
  process.once('SIGINT', () => shutdown('SIGINT'))
  process.once('SIGTERM', () => shutdown('SIGTERM'))
}
