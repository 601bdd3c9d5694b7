import { Router, type Request, type RequestHandler, type Response } from 'express'
import { rateLimit, ipKeyGenerator } from 'express-rate-limit'
import { AppError } from '../../lib/app-error.js'
import { signInBody, signUpBody } from './auth-schema.js'
import type { PassportInstance } from './auth-passport.js'
import type { AuthService, PublicUser } from './auth-service.js'

interface AuthRouteDeps {
  auth: AuthService
  passport: PassportInstance
  csrfToken: (req: Request) => string
  /** Called after a sign-out, so the user's live sockets (sync, surface stream) can be closed. */
  onSignOut?: (userId: string) => void
}

/** Sign-in failures allowed per IP + e-mail in the window (successful sign-ins do not count). */
export const SIGNIN_FAILURE_LIMIT = 10
export const SIGNIN_WINDOW_MS = 15 * 60 * 1000

const login = (req: Request, user: PublicUser) =>
  new Promise<void>((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())))

export function authRoutes({ auth, passport, csrfToken, onSignOut }: AuthRouteDeps): Router {
  const router = Router()

  const signInLimiter = rateLimit({
    windowMs: SIGNIN_WINDOW_MS,
    limit: SIGNIN_FAILURE_LIMIT,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String(req.body?.email ?? '').trim().toLowerCase()}`,
    handler: (_req, res) => {
      res.status(429).json({ error: { code: 'rate_limited', message: 'Too many failed sign-ins; try again in 15 minutes.' } })
    },
  })

  router.get('/csrf', (req, res) => {
    res.json({ token: csrfToken(req) })
  })

  router.get('/me', (req, res) => {
    res.json({ user: req.user ? { id: req.user.id, email: req.user.email, name: req.user.name } : null })
  })

  router.post('/signup', async (req, res) => {
    const body = signUpBody.parse(req.body)
    const user = await auth.signUp(body)
    await login(req, user)
    res.status(201).json({ user })
  })

  router.post('/signin', signInLimiter, async (req: Request, res: Response) => {
    const body = signInBody.parse(req.body)
    req.body = body
    const user = await new Promise<PublicUser | false>((resolve, reject) => {
      const authenticate = passport.authenticate('local', { session: false }, (err: unknown, u: PublicUser | false) =>
        err ? reject(err) : resolve(u),
      ) as RequestHandler
      authenticate(req, res, reject)
    })
    if (!user) throw new AppError('bad_credentials', 401, 'E-mail or password is wrong.')
    await login(req, user)
    res.json({ user })
  })

  router.post('/signout', async (req, res) => {
    const userId = req.user?.id
    await new Promise<void>((resolve, reject) => req.logout((err) => (err ? reject(err) : resolve())))
    // An open socket was authenticated once, at its upgrade: without this it would outlive the session.
    if (userId) onSignOut?.(userId)
    res.status(204).end()
  })

  return router
}
