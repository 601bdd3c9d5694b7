import { Router, type Request, type RequestHandler, type Response } from 'express'
import { AppError } from '../../lib/app-error.js'
import { HOUR_MS, ipOf, limiter } from '../../lib/rate-limits.js'
import { signInBody, signUpBody } from './auth-schema.js'
import type { PassportInstance } from './auth-passport.js'
import type { AuthService, PublicUser } from './auth-service.js'

interface AuthRouteDeps {
  auth: AuthService
  passport: PassportInstance
  csrfToken: (req: Request) => string
  /** Called after a sign-out, so the user's live sockets (sync, surface stream) can be closed. */
  onSignOut?: (userId: string) => void
  /** Config's abuse limits: sign-ups per address per hour, failed sign-ins per address (any e-mail). */
  limits: { signUpsPerHour: number; signInFailuresPerIp: number }
}

/** Sign-in failures allowed per IP + e-mail in the window (successful sign-ins do not count). */
export const SIGNIN_FAILURE_LIMIT = 10
export const SIGNIN_WINDOW_MS = 15 * 60 * 1000

const login = (req: Request, user: PublicUser) =>
  new Promise<void>((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())))

export function authRoutes({ auth, passport, csrfToken, onSignOut, limits }: AuthRouteDeps): Router {
  const router = Router()

  // One address guessing many passwords for one account, and one address trying a few common
  // passwords on many accounts (password spraying): each is stopped by its own count.
  const signInPerAccount = limiter({
    what: 'failed sign-ins for this e-mail from this address',
    windowMs: SIGNIN_WINDOW_MS,
    limit: SIGNIN_FAILURE_LIMIT,
    failuresOnly: true,
    // Only a string is an e-mail; String() of anything else could recurse (a nested array) or throw.
    key: (req) => `${ipOf(req)}|${typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : ''}`,
  })
  const signInPerAddress = limiter({
    what: 'failed sign-ins from this address',
    windowMs: SIGNIN_WINDOW_MS,
    limit: limits.signInFailuresPerIp,
    failuresOnly: true,
    key: 'ip',
  })
  // Every attempt counts: a refused one (409 email_taken) tells whether an address has an account.
  const signUpLimiter = limiter({
    what: 'sign-ups from this address',
    windowMs: HOUR_MS,
    limit: limits.signUpsPerHour,
    key: 'ip',
  })

  router.get('/csrf', (req, res) => {
    res.json({ token: csrfToken(req) })
  })

  router.get('/me', (req, res) => {
    res.json({ user: req.user ? { id: req.user.id, email: req.user.email, name: req.user.name } : null })
  })

  router.post('/signup', signUpLimiter, async (req, res) => {
    const body = signUpBody.parse(req.body)
    const user = await auth.signUp(body)
    await login(req, user)
    res.status(201).json({ user })
  })

  router.post('/signin', signInPerAddress, signInPerAccount, async (req: Request, res: Response) => {
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
