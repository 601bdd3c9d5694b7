// `tsx scripts/migrate.ts [--seed]`: applies pending migrations (and the demo seed) once, before
// servers or parallel test workers start, so they never race to create tables.
import { loadConfig } from '../server/config.js'
import { createDataSource } from '../server/db/data-source.js'
import { seedDemo } from '../server/db/seed.js'
import { seedRoomFrames } from '../server/realtime/index.js'

const config = loadConfig()
const dataSource = createDataSource(config)
await dataSource.initialize()
try {
  const ran = await dataSource.runMigrations({ transaction: 'each' })
  console.log(`[migrate] ${config.DB_NAME}: ${ran.length ? ran.map((m) => m.name).join(', ') : 'up to date'}`)
  if (process.argv.includes('--seed')) {
    const rooms = await seedDemo(dataSource, config.BCRYPT_COST)
    // only rooms whose document is still empty get a frame, so a re-run keeps the team's edits
    await seedRoomFrames(dataSource, { [rooms.courtyard]: 'tent', [rooms['shade-sail']]: 'sail' })
  }
} finally {
  await dataSource.destroy()
}
