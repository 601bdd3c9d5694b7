import type { AddressInfo } from 'node:net'
import express from 'express'
import type { DataSource } from 'typeorm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { errorHandler } from '../../server/lib/error-handler.js'
import { devMailboxRoutes } from '../../server/mail/dev-mailbox-routes.js'
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp.js'
import { memoryMailbox } from '../../server/mail/mailbox.js'
import { createMailer } from '../../server/mail/mailer.js'
import { decodeHeader } from '../../server/mail/mail-parse.js'

// The encoder on the other side is nodemailer itself (the reference library): whatever it sends,
// the fake server must read back to the same subject, text and HTML.
describe('fake SMTP server', () => {
  const mailbox = memoryMailbox()
  let smtp: FakeSmtp

  beforeAll(async () => {
    smtp = await startFakeSmtp(mailbox, 0)
  })
  afterAll(async () => {
    await smtp.close()
  })

  it('receives a nodemailer message with UTF-8 subject, long text and HTML', async () => {
    const mailer = createMailer({
      host: '127.0.0.1',
      port: smtp.port,
      from: 'Veilroom <no-reply@veilroom.test>',
      secure: false,
    })
    const longLine = 'Courtyard canopy — Example Yard A: ' + 'ä'.repeat(120)
    const text = `Hello Åsa,\n\n${longLine}\nhttp://127.0.0.1:3210/invite/abc_DEF-123=\n`
    await mailer.send({
      to: 'asa@example.test',
      subject: 'Join “Terrace sail” as reviewer',
      text,
      html: '<p>Hello <b>Åsa</b></p>',
    })
    mailer.close()
    const [m] = await mailbox.list()
    expect(m?.to).toBe('asa@example.test')
    expect(m?.subject).toBe('Join “Terrace sail” as reviewer')
    expect(m?.text).toBe(text)
    expect(m?.html).toBe('<p>Hello <b>Åsa</b></p>')
  })

  it('accepts any credentials, since it only ever runs on loopback', async () => {
    const mailer = createMailer({
      host: '127.0.0.1',
      port: smtp.port,
      user: 'dev',
      pass: 'x',
      from: 'a@b.test',
      secure: false,
    })
    await mailer.send({ to: 'b@example.test', subject: 'plain', text: 'only text' })
    mailer.close()
    const [m] = await mailbox.list(1)
    expect(m).toMatchObject({ to: 'b@example.test', subject: 'plain', text: 'only text' })
    expect(m?.html).toBeUndefined()
  })

  // RFC 2047 section 8 gives these examples of encoded words and their display forms.
  it('decodes RFC 2047 encoded words as in the RFC examples', () => {
    expect(decodeHeader('=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=')).toBe('ab')
    expect(decodeHeader('=?ISO-8859-1?Q?a_b?=')).toBe('a b')
    expect(decodeHeader('=?utf-8?B?w4VzYQ==?=')).toBe('Åsa')
  })
})

describe('dev mailbox route', () => {
  it('answers 404 in production without touching the database', async () => {
    const app = express()
    // No database at all: the production router must not need one.
    app.use('/api/dev', devMailboxRoutes({ dataSource: {} as DataSource, production: true }))
    app.use(errorHandler)
    const server = app.listen(0, '127.0.0.1')
    await new Promise((r) => server.once('listening', r))
    try {
      const res = await fetch(`http://127.0.0.1:${(server.address() as AddressInfo).port}/api/dev/mailbox`)
      expect(res.status).toBe(404)
      expect(((await res.json()) as { error: { code: string } }).error.code).toBe('not_found')
    } finally {
      server.close()
    }
  })
})
