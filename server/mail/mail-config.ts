import { z } from 'zod'

// SMTP settings, read once like server/config.ts. The defaults point at the fake SMTP server that
// `npm start` runs on loopback, so invites work in development without a real mail account.
const schema = z.object({
  SMTP_HOST: z.string().min(1).default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  SMTP_FROM: z.string().min(3).default('Veilroom <no-reply@veilroom.test>'),
  // Port 465 speaks TLS from the first byte; other ports may upgrade with STARTTLS.
  SMTP_SECURE: z.enum(['true', 'false']).optional(),
})

export interface MailConfig {
  host: string
  port: number
  user?: string
  pass?: string
  from: string
  secure: boolean
}

/** Reads SMTP_* from the environment; throws one readable error naming every bad variable. */
export function loadMailConfig(env: NodeJS.ProcessEnv = process.env): MailConfig {
  const result = schema.safeParse(env)
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`)
    throw new Error(`Invalid mail configuration:\n${lines.join('\n')}`)
  }
  const e = result.data
  return {
    host: e.SMTP_HOST,
    port: e.SMTP_PORT,
    user: e.SMTP_USER || undefined,
    pass: e.SMTP_PASS || undefined,
    from: e.SMTP_FROM,
    secure: e.SMTP_SECURE ? e.SMTP_SECURE === 'true' : e.SMTP_PORT === 465,
  }
}
