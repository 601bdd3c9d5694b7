import { describe, expect, it } from 'vitest'
import { ApiError } from '../../src/api/http'
import { splitApiError, useFormErrors } from '../../src/composables/use-form-errors'
import { formatLastChange } from '../../src/lib/format'
import { can, roleCovers, roomRoles, type RoomAction, type RoomRole } from '../../shared/protocol'
import { checkRoom, checkSignUp } from '../../src/lib/validation'

describe('server errors land beside the field they name', () => {
  const fields = ['name', 'email', 'password'] as const

  it('uses the field as given, or the last segment of a zod path', () => {
    expect(splitApiError(new ApiError('invalid_input', 'Too short', 'password', 400), fields)).toEqual({
      fields: { password: 'Too short' },
      general: null,
    })
    expect(splitApiError(new ApiError('email_taken', 'Already registered', 'body.email', 409), fields).fields).toEqual({
      email: 'Already registered',
    })
  })

  it('puts errors without a known field above the form', () => {
    expect(splitApiError(new ApiError('bad_credentials', 'Wrong e-mail or password', undefined, 401), fields)).toEqual({
      fields: {},
      general: 'Wrong e-mail or password',
    })
    expect(splitApiError(new ApiError('invalid_input', 'Bad', 'colour', 400), fields).general).toBe('Bad')
  })

  it('clears old errors when new ones arrive', () => {
    const form = useFormErrors(fields)
    form.capture(new ApiError('invalid_input', 'Too short', 'password', 400))
    expect(form.itemProps('password')).toEqual({ validationStatus: 'error', feedback: 'Too short' })
    form.capture(new ApiError('rate_limited', 'Too many attempts', undefined, 429))
    expect(form.itemProps('password')).toEqual({})
    expect(form.general.value).toBe('Too many attempts')
  })
})

describe('checks before sending mirror the server rules (API contract, issue 2)', () => {
  it('asks for 10 password characters, a name and an e-mail shape', () => {
    expect(checkSignUp({ email: 'a@b.test', name: 'A', password: '123456789' })).toEqual({
      password: 'Use at least 10 characters.',
    })
    expect(checkSignUp({ email: 'a@b.test', name: 'A', password: '1234567890' })).toEqual({})
    expect(Object.keys(checkSignUp({ email: 'not-mail', name: ' ', password: '' })).sort()).toEqual([
      'email',
      'name',
      'password',
    ])
  })

  it('limits room names to 1..120 characters and descriptions to 2000', () => {
    expect(checkRoom({ name: '   ', description: '' }).name).toBeDefined()
    expect(checkRoom({ name: 'x'.repeat(120), description: 'd'.repeat(2000) })).toEqual({})
    expect(Object.keys(checkRoom({ name: 'x'.repeat(121), description: 'd'.repeat(2001) }))).toEqual([
      'name',
      'description',
    ])
  })
})

describe('role table (shared/protocol/roles.ts) against PRODUCT.md "Words"', () => {
  // PRODUCT.md: owner all rights / editor edit frame, snapshots, pins / reviewer pins only / viewer read only.
  const everything: RoomAction[] = [
    'read',
    'pin',
    'resolvePin',
    'editFrame',
    'snapshot',
    'rename',
    'manageMembers',
    'deleteRoom',
  ]
  const allowed = (role: RoomRole) => everything.filter((a) => can(role, a))

  it('owner: all rights', () => expect(allowed('owner')).toEqual(everything))
  it('editor: frame, snapshots, pins, but not the members or the room itself', () => {
    expect(can('editor', 'editFrame') && can('editor', 'snapshot') && can('editor', 'pin')).toBe(true)
    expect(can('editor', 'manageMembers') || can('editor', 'deleteRoom')).toBe(false)
  })
  it('reviewer: pins only', () => expect(allowed('reviewer')).toEqual(['read', 'pin']))
  it('viewer: read only', () => expect(allowed('viewer')).toEqual(['read']))
  it('each role has every right of the roles listed after it (an accepted invite never lowers a role)', () => {
    roomRoles.forEach((role, i) => {
      for (const weaker of roomRoles.slice(i + 1)) expect(roleCovers(role, weaker), `${role} ⊇ ${weaker}`).toBe(true)
      for (const stronger of roomRoles.slice(0, i))
        expect(roleCovers(role, stronger), `${role} ⊉ ${stronger}`).toBe(false)
    })
  })
})

describe('formatLastChange', () => {
  // Expected strings are those of ECMA-402 Intl.RelativeTimeFormat, locale "en", numeric "auto".
  const now = new Date('2026-12-01T12:00:00Z')
  it.each([
    ['2026-12-01T11:59:30Z', 'just now'],
    ['2026-12-01T11:55:00Z', '5 minutes ago'],
    ['2026-12-01T09:00:00Z', '3 hours ago'],
    ['2026-11-30T12:00:00Z', 'yesterday'],
    ['2026-11-17T12:00:00Z', '2 weeks ago'],
    ['not a date', '—'],
  ])('%s → %s', (iso, expected) => {
    expect(formatLastChange(iso, now)).toBe(expected)
  })
})
