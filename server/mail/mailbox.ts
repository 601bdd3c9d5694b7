import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import { DevMailEntity } from '../db/entities/dev-mail.js'

/** One message as the dev mailbox shows it. */
export interface MailboxMessage {
  id: string
  to: string
  subject: string
  text: string
  html?: string
  date: string
}

export interface MailboxStore {
  save(message: Omit<MailboxMessage, 'id' | 'date'> & { date: Date }): Promise<void>
  /** Newest first. */
  list(limit?: number): Promise<MailboxMessage[]>
}

/** The fake SMTP server's mailbox in MariaDB (table dev_mail), readable from any process. */
export function dbMailbox(dataSource: DataSource): MailboxStore {
  const repo = dataSource.getRepository(DevMailEntity)
  return {
    async save(m) {
      await repo.insert({ id: randomUUID(), to: m.to, subject: m.subject, text: m.text, html: m.html ?? null, receivedAt: m.date })
    },
    async list(limit = 100) {
      const rows = await repo.find({ order: { receivedAt: 'DESC' }, take: limit })
      return rows.map((r) => ({
        id: r.id,
        to: r.to,
        subject: r.subject,
        text: r.text,
        ...(r.html !== null ? { html: r.html } : {}),
        date: r.receivedAt.toISOString(),
      }))
    },
  }
}

/** A mailbox in memory, for a fake server that runs without a database. */
export function memoryMailbox(): MailboxStore {
  const messages: MailboxMessage[] = []
  return {
    async save(m) {
      messages.unshift({ id: randomUUID(), to: m.to, subject: m.subject, text: m.text, ...(m.html ? { html: m.html } : {}), date: m.date.toISOString() })
    },
    async list(limit = 100) {
      return messages.slice(0, limit)
    },
  }
}
