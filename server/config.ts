import { hostname } from 'node:os'
import { z } from 'zod'

const limit = z.coerce.number().int().min(1, 'at least 1').max(1_000_000, 'at most 1000000')

// Read once at start. A wrong value stops the server with the variable's name and the reason,
// rather than failing later inside a request.
const schema = z
  .object({
    NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
    HOST: z.string().min(1).default('127.0.0.1'),
    PORT: z.coerce.number().int().min(0).max(65535).default(3210),
    DB_HOST: z.string().min(1).default('127.0.0.1'),
    DB_PORT: z.coerce.number().int().min(1).max(65535).default(3307),
    DB_NAME: z
      .string()
      .regex(/^[A-Za-z0-9_]+$/, 'letters, digits and _ only')
      .default('veilroom'),
    DB_USER: z.string().min(1).default('veilroom'),
    DB_PASSWORD: z.string().default('veilroom-dev-password'),
    SESSION_SECRET: z.string().min(16, 'at least 16 characters').optional(),
    PUBLIC_URL: z.url().default('http://127.0.0.1:3210'),
    // 12 in use; tests may lower it to 10 (OWASP's floor for bcrypt) to keep the suite quick.
    BCRYPT_COST: z.coerce.number().int().min(10, 'at least 10').max(15, 'at most 15').default(12),
    LOG_LEVEL: z.enum(['debug', 'info', 'warn', 'error', 'silent']).default('info'),
    // worker threads that solve surfaces; one per core keeps the event loop free on this 2-core class
    SOLVE_WORKERS: z.coerce.number().int().min(1, 'at least 1').max(64, 'at most 64').default(2),
    // scale-out: unset = one process, no Redis (npm start); set = this instance shares rooms over Redis
    REDIS_URL: z
      .url()
      .refine((u) => /^rediss?:\/\//.test(u), 'must start with redis:// or rediss://')
      .optional(),
    // a stable name for this instance in /api/health and logs; defaults to host:port
    INSTANCE_ID: z
      .string()
      .regex(/^[A-Za-z0-9_.:-]{1,64}$/, 'letters, digits, _ . : - only (1–64)')
      .optional(),
    // Abuse limits (issue 12): generous for a team, small for a script. Sign-ups per client address
    // per hour; rooms and invites per signed-in user per hour; failed sign-ins per address per 15
    // minutes summed over every e-mail tried (password spraying), besides 10 per address + e-mail.
    RATE_SIGNUPS_PER_HOUR: limit.default(20),
    RATE_ROOMS_PER_HOUR: limit.default(30),
    RATE_INVITES_PER_HOUR: limit.default(50),
    RATE_SIGNIN_FAILURES_PER_IP: limit.default(50),
  })
  .transform((env, ctx) => {
    if (!env.SESSION_SECRET && env.NODE_ENV === 'production') {
      ctx.addIssue({ code: 'custom', path: ['SESSION_SECRET'], message: 'required when NODE_ENV=production' })
      return z.NEVER
    }
    return {
      ...env,
      SESSION_SECRET: env.SESSION_SECRET ?? 'veilroom-development-secret-not-for-production',
      INSTANCE_ID: env.INSTANCE_ID ?? `${hostname()}:${env.PORT}`,
    }
  })

export type Config = z.output<typeof schema>

/** Parses an environment (process.env by default); throws one readable error listing every bad variable. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const result = schema.safeParse(env)
  if (result.success) return result.data
  const lines = result.error.issues.map((i) => `  ${i.path.join('.') || '(env)'}: ${i.message}`)
  throw new Error(`Invalid configuration:\n${lines.join('\n')}`)
}
