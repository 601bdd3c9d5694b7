import type { RequestHandler } from 'express'
import session from 'express-session'
import MySQLStoreFactory from 'express-mysql-session'
import type { DataSource } from 'typeorm'
import type { Config } from './config.js'
import { mysqlPool } from './db/data-source.js'

export const SESSION_COOKIE = 'veilroom.sid'
const SESSION_DAYS = 14

export interface SessionParts {
  middleware: RequestHandler
  /** Stops the store's expiry timer; the shared pool is closed with the DataSource. */
  close: () => Promise<void>
}

/**
 * Sessions in MariaDB's `sessions` table (made by the initial migration), on TypeORM's own mysql2
 * pool. The returned middleware also works on a websocket upgrade request, so realtime code can
 * read req.session.passport.user the same way routes do.
 */
export function createSession(config: Config, dataSource: DataSource): SessionParts {
  const MySQLStore = MySQLStoreFactory(session)
  const store = new MySQLStore(
    {
      createDatabaseTable: false,
      clearExpired: true,
      checkExpirationInterval: 15 * 60 * 1000,
      expiration: SESSION_DAYS * 24 * 3600 * 1000,
    },
    mysqlPool(dataSource) as ConstructorParameters<typeof MySQLStore>[1],
  )
  const middleware = session({
    name: SESSION_COOKIE,
    secret: config.SESSION_SECRET,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: config.PUBLIC_URL.startsWith('https:'),
      maxAge: SESSION_DAYS * 24 * 3600 * 1000,
    },
  })
  return { middleware, close: () => store.close() }
}
