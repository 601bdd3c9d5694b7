import { EntitySchema } from 'typeorm'

/**
 * A message caught by the fake SMTP server (development and tests only). Kept in MariaDB so the
 * dev mailbox route can read it even when the fake server runs in another process.
 */
export interface DevMail {
  id: string
  to: string
  subject: string
  text: string
  html: string | null
  receivedAt: Date
}

export const DevMailEntity = new EntitySchema<DevMail>({
  name: 'DevMail',
  tableName: 'dev_mail',
  columns: {
    id: { type: 'char', length: 36, primary: true },
    to: { type: 'varchar', length: 1000, name: 'to_addr' },
    subject: { type: 'text' },
    text: { type: 'mediumtext' },
    html: { type: 'mediumtext', nullable: true },
    receivedAt: { type: 'datetime', precision: 3, name: 'received_at' },
  },
})
