import passport from 'passport'
import { Strategy as LocalStrategy } from 'passport-local'
import type { AuthService, PublicUser } from './auth-service.js'

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends PublicUser {}
  }
}

/**
 * One Authenticator per app (not passport's global), so several apps can live in one process
 * (tests). The session holds only the user id; the user is re-read on each request so a deleted
 * account is signed out at once.
 */
export type PassportInstance = InstanceType<(typeof passport)['Authenticator']>

export function createPassport(auth: AuthService): PassportInstance {
  const p = new passport.Authenticator()
  p.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      auth.verify(email, password).then((user) => done(null, user ?? false), done)
    }),
  )
  p.serializeUser((user, done) => done(null, user.id))
  p.deserializeUser((id: string, done) => {
    auth.findPublic(id).then((user) => done(null, user ?? false), done)
  })
  return p
}
