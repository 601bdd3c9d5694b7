import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import { DevMailEntity, type DevMail } from '../db/entities/dev-mail.js'

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
  /** Newest first, only messages with `address` among their recipients (case-insensitive). */
  listTo(address: string, limit?: number): Promise<MailboxMessage[]>
}

/** Whether a "a@x, b@y" recipient list holds the address (case-insensitive). */
export const addressedTo = (to: string, address: string): boolean =>
  to.toLowerCase().split(/,\s*/).includes(address.trim().toLowerCase())

// LIKE treats % and _ as wildcards and \ as its escape: an address is matched literally.
const likeLiteral = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`)

/** The fake SMTP server's mailbox in MariaDB (table dev_mail), readable from any process. */
export function dbMailbox(dataSource: DataSource): MailboxStore {
  const repo = dataSource.getRepository(DevMailEntity)
  return {
    async save(m) {
      await repo.insert({
        id: randomUUID(),
        to: m.to,
        subject: m.subject,
        text: m.text,
        html: m.html ?? null,
        receivedAt: m.date,
      })
    },
    async list(limit = 100) {
      return (await repo.find({ order: { receivedAt: 'DESC' }, take: limit })).map(view)
    },
    async listTo(address, limit = 100) {
      const rows = await repo
        .createQueryBuilder('m')
        .where("CONCAT(', ', LOWER(m.to_addr), ',') LIKE :pattern", {
          pattern: `%, ${likeLiteral(address.trim().toLowerCase())},%`,
        })
        .orderBy('m.receivedAt', 'DESC')
        .take(limit)
        .getMany()
      // The fake server joins recipients with ", "; the check in code keeps exactness if that changes.
      return rows.filter((r) => addressedTo(r.to, address)).map(view)
    },
  }
}

function view(r: DevMail): MailboxMessage {
  return {
    id: r.id,
    to: r.to,
    subject: r.subject,
    text: r.text,
    ...(r.html !== null ? { html: r.html } : {}),
    date: r.receivedAt.toISOString(),
  }
}

/** A mailbox in memory, for a fake server that runs without a database. */
export function memoryMailbox(): MailboxStore {
  const messages: MailboxMessage[] = []
  return {
    async save(m) {
      messages.unshift({
        id: randomUUID(),
        to: m.to,
        subject: m.subject,
        text: m.text,
        ...(m.html ? { html: m.html } : {}),
        date: m.date.toISOString(),
      })
    },
    async list(limit = 100) {
      return messages.slice(0, limit)
    },
    async listTo(address, limit = 100) {
      return messages.filter((m) => addressedTo(m.to, address)).slice(0, limit)
    },
  }
}
