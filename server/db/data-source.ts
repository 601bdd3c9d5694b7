import { readdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import { DataSource, EntitySchema, type MigrationInterface } from 'typeorm'
import type { Config } from '../config.js'

type MigrationClass = new () => MigrationInterface

// Every module in entities/ and migrations/ is picked up, so a feature adds its tables by adding
// files, without editing a shared list. index.ts files only re-export and are skipped.
async function importAll(dir: string): Promise<unknown[]> {
  const files = readdirSync(dir)
    .filter((f) => /\.(ts|js|mjs)$/.test(f) && !f.endsWith('.d.ts') && !/^index\./.test(f) && !/\.test\./.test(f))
    .sort()
  const exported: unknown[] = []
  for (const file of files) {
    const mod = (await import(pathToFileURL(resolve(dir, file)).href)) as Record<string, unknown>
    exported.push(...Object.values(mod))
  }
  return exported
}

const isMigrationClass = (v: unknown): v is MigrationClass =>
  typeof v === 'function' && typeof (v.prototype as Partial<MigrationInterface> | undefined)?.up === 'function'

/** All EntitySchema exports of server/db/entities and migration classes of server/db/migrations. */
export async function loadModels(): Promise<{ entities: EntitySchema[]; migrations: MigrationClass[] }> {
  const here = import.meta.dirname
  const entities = [...new Set((await importAll(resolve(here, 'entities'))).filter((v) => v instanceof EntitySchema))]
  // Migration files are named <timestamp>-<what>.ts; sorted file names give timestamp order.
  const migrations = [...new Set((await importAll(resolve(here, 'migrations'))).filter(isMigrationClass))]
  return { entities: entities as EntitySchema[], migrations }
}

// Top-level await: the model list is read once at import, so createDataSource() stays synchronous.
const models = await loadModels()

type DbConfig = Pick<Config, 'DB_HOST' | 'DB_PORT' | 'DB_NAME' | 'DB_USER' | 'DB_PASSWORD'>

/**
 * The one TypeORM DataSource for MariaDB (not yet initialised). Schema changes go through
 * timestamped migrations (synchronize stays off); start() runs pending ones.
 */
export function createDataSource(config: DbConfig): DataSource {
  const { entities, migrations } = models
  return new DataSource({
    type: 'mariadb',
    host: config.DB_HOST,
    port: config.DB_PORT,
    database: config.DB_NAME,
    username: config.DB_USER,
    password: config.DB_PASSWORD,
    charset: 'utf8mb4_unicode_ci',
    timezone: 'Z',
    entities,
    migrations,
    migrationsTableName: 'migrations',
    synchronize: false,
    logging: ['error'],
    poolSize: 10,
  })
}

/** The underlying mysql2 pool, shared with the session store so there is one set of connections. */
export function mysqlPool(dataSource: DataSource): unknown {
  return (dataSource.driver as unknown as { pool: unknown }).pool
}
