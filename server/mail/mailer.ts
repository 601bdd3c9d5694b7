import nodemailer from 'nodemailer'
import type { MailConfig } from './mail-config.js'

export interface OutgoingMail {
  to: string
  subject: string
  text: string
  html?: string
}

export interface Mailer {
  /** Hands the message to the SMTP server; rejects when the server refuses it or cannot be reached. */
  send(mail: OutgoingMail): Promise<void>
  close(): void
}

/** A nodemailer SMTP transport built from the mail configuration. */
export function createMailer(config: MailConfig): Mailer {
  const transport = nodemailer.createTransport({
    host: config.host,
    port: config.port,
    secure: config.secure,
    auth: config.user ? { user: config.user, pass: config.pass ?? '' } : undefined,
    // A stuck mail server must not hold an HTTP request for minutes.
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  })
  return {
    async send(mail) {
      await transport.sendMail({ from: config.from, ...mail })
    },
    close: () => transport.close(),
  }
}
