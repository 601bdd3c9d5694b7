import { describe, expect, it } from 'vitest'
import { decide, safeRedirect, type GuardTarget } from '../../src/router/guard'

// The rules come from the client brief (issue 2): signed-out → sign-in with ?redirect= back;
// signed-in visiting sign-in → rooms. Redirect filtering follows the OWASP "Unvalidated Redirects
// and Forwards" cheat sheet (recalled from memory): only accept same-site relative paths.

const target = (
  fullPath: string,
  meta: GuardTarget['meta'] = {},
  query: Record<string, unknown> = {},
  name?: string,
): GuardTarget => ({
  fullPath,
  meta,
  query,
  name,
})

describe('decide', () => {
  it('sends a signed-out visitor of a room to sign-in with the way back', () => {
    expect(decide(target('/rooms/abc?tab=pins'), false)).toEqual({
      name: 'sign-in',
      query: { redirect: '/rooms/abc?tab=pins' },
    })
  })

  it('leaves out ?redirect= when the way back is the rooms list anyway', () => {
    expect(decide(target('/rooms', {}, {}, 'rooms'), false)).toEqual({ name: 'sign-in', query: {} })
  })

  it('lets a signed-out visitor reach public pages', () => {
    expect(decide(target('/sign-in', { public: true, guestOnly: true }), false)).toBe(true)
    expect(decide(target('/nowhere', { public: true }), false)).toBe(true)
  })

  it('sends a signed-in visitor of sign-in to rooms, or to a safe redirect', () => {
    const guest = { public: true, guestOnly: true }
    expect(decide(target('/sign-in', guest), true)).toEqual({ name: 'rooms' })
    expect(decide(target('/sign-in', guest, { redirect: '/rooms/r1' }), true)).toBe('/rooms/r1')
    expect(decide(target('/sign-in', guest, { redirect: 'https://evil.example/' }), true)).toEqual({ name: 'rooms' })
  })

  it('lets a signed-in visitor through to members-only pages', () => {
    expect(decide(target('/rooms/r1'), true)).toBe(true)
  })
})

describe('safeRedirect', () => {
  it.each([
    ['/rooms/r1', '/rooms/r1'],
    [['/rooms/r2', '/x'], '/rooms/r2'],
    ['//evil.example/path', null],
    ['/\\evil.example', null],
    ['https://evil.example', null],
    ['javascript:alert(1)', null],
    [undefined, null],
    [42, null],
  ])('%j → %j', (input, expected) => {
    expect(safeRedirect(input)).toBe(expected)
  })
})
