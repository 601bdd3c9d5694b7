import type { AddressInfo } from 'node:net'
import { SMTPServer } from 'smtp-server'
import { logger } from '../lib/logger.js'
import type { MailboxStore } from './mailbox.js'
import { parseMail } from './mail-parse.js'

/** Larger messages are refused: invites are a few kilobytes. */
const MAX_MESSAGE_BYTES = 5 * 1024 * 1024

export interface FakeSmtp {
  port: number
  close(): Promise<void>
}

/**
 * An SMTP server on loopback that accepts every message and files it into the store, so invites
 * can be read in the dev mailbox and in tests. No TLS (loopback only); any user name and password
 * is accepted. Port 0 picks a free port.
 */
export async function startFakeSmtp(store: MailboxStore, port = 2525, host = '127.0.0.1'): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    allowInsecureAuth: true,
    disabledCommands: ['STARTTLS'],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    onAuth(auth, _session, done) {
      done(null, { user: auth.username ?? 'dev' })
    },
    onData(stream, session, done) {
      const chunks: Buffer[] = []
      stream.on('data', (c: Buffer) => chunks.push(c))
      stream.on('end', () => {
        if (stream.sizeExceeded) return done(Object.assign(new Error('Message too large'), { responseCode: 552 }))
        const parsed = parseMail(Buffer.concat(chunks))
        const to = session.envelope.rcptTo.map((r) => r.address).join(', ')
        store.save({ to, ...parsed }).then(
          () => done(),
          (err: unknown) => {
            logger.error('fake SMTP could not store a message', { err: String(err) })
            done(Object.assign(new Error('Mailbox unavailable'), { responseCode: 451 }))
          },
        )
      })
    },
  })
  server.on('error', (err) => logger.warn('fake SMTP error', { err: String(err) }))
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, host, () => resolve())
  })
  const address = server.server.address() as AddressInfo
  return {
    port: address.port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  }
}
