// Runs the fake SMTP server as its own process, filing mail into MariaDB (table dev_mail) so the
// server's GET /api/dev/mailbox can show it. Started by scripts/start.mjs outside production.
import { loadConfig } from '../config.js'
import { createDataSource } from '../db/data-source.js'
import { logger } from '../lib/logger.js'
import { startFakeSmtp } from './fake-smtp.js'
import { dbMailbox } from './mailbox.js'

const config = loadConfig()
if (config.NODE_ENV === 'production') {
  logger.error('the fake SMTP server is for development only; set SMTP_HOST to a real server in production')
  process.exit(1)
}
// SMTP_PORT=0 picks a free port (tests); the line printed below tells the parent which.
const port = Number(process.env.SMTP_PORT ?? 2525)
if (!Number.isInteger(port) || port < 0 || port > 65535) {
  logger.error(`SMTP_PORT=${process.env.SMTP_PORT}: not a port number`)
  process.exit(1)
}
const dataSource = await createDataSource(config).initialize()
const smtp = await startFakeSmtp(dbMailbox(dataSource), port)
// The parent process reads this line to learn the port (useful with SMTP_PORT=0).
console.log(`fake SMTP listening on 127.0.0.1:${smtp.port}`)

const stop = async () => {
  await smtp.close()
  await dataSource.destroy()
  process.exit(0)
}
process.on('SIGTERM', () => void stop())
process.on('SIGINT', () => void stop())
