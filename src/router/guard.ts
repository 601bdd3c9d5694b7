import type { RouteLocationRaw } from 'vue-router'

/** What the guard needs to know about the route being entered. */
export interface GuardTarget {
  name?: string | symbol | null | undefined
  fullPath: string
  meta: { public?: boolean; guestOnly?: boolean }
  query: Record<string, unknown>
}

/**
 * Only same-site paths are followed after sign-in: "//evil.example" or "https://…" in ?redirect=
 * would otherwise turn our sign-in page into an open redirect.
 */
export function safeRedirect(value: unknown): string | null {
  const raw = Array.isArray(value) ? value[0] : value
  if (typeof raw !== 'string' || !raw.startsWith('/') || raw.startsWith('//') || raw.startsWith('/\\')) return null
  return raw
}

/**
 * Signed-out visitors of a members-only page go to sign-in with ?redirect= back to it; signed-in
 * visitors of sign-in/sign-up go to their rooms (or to the redirect they came with).
 */
export function decide(to: GuardTarget, signedIn: boolean): true | RouteLocationRaw {
  if (!signedIn && !to.meta.public) {
    return { name: 'sign-in', query: to.fullPath === '/' || to.name === 'rooms' ? {} : { redirect: to.fullPath } }
  }
  if (signedIn && to.meta.guestOnly) {
    return safeRedirect(to.query.redirect) ?? { name: 'rooms' }
  }
  return true
}
