import { describe, expect, it } from 'vitest'
import { ApiError } from '../../src/api/http'
import { splitApiError, useFormErrors } from '../../src/composables/use-form-errors'
import { formatLastChange } from '../../src/lib/format'
import { canDelete, canEditFrame, canRename } from '../../src/lib/roles'
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
    expect(checkSignUp({ email: 'a@b.test', name: 'A', password: '123456789' })).toEqual({ password: 'Use at least 10 characters.' })
    expect(checkSignUp({ email: 'a@b.test', name: 'A', password: '1234567890' })).toEqual({})
    expect(Object.keys(checkSignUp({ email: 'not-mail', name: ' ', password: '' })).sort()).toEqual(['email', 'name', 'password'])
  })

  it('limits room names to 1..120 characters and descriptions to 2000', () => {
    expect(checkRoom({ name: '   ', description: '' }).name).toBeDefined()
    expect(checkRoom({ name: 'x'.repeat(120), description: 'd'.repeat(2000) })).toEqual({})
    expect(Object.keys(checkRoom({ name: 'x'.repeat(121), description: 'd'.repeat(2001) }))).toEqual(['name', 'description'])
  })
})

describe('role rules match the server (owner/editor edit, owner deletes; PRODUCT.md "Words")', () => {
  it.each([
    ['owner', true, true, true],
    ['editor', true, false, true],
    ['reviewer', false, false, false],
    ['viewer', false, false, false],
  ] as const)('%s: rename %s, delete %s, edit frame %s', (role, rename, remove, edit) => {
    expect([canRename(role), canDelete(role), canEditFrame(role)]).toEqual([rename, remove, edit])
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
