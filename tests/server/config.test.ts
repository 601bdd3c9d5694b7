import { describe, expect, it } from 'vitest'
import { loadConfig } from '../../server/config.js'

describe('configuration', () => {
  it('has working development defaults, bcrypt cost 12 included', () => {
    const c = loadConfig({})
    expect(c).toMatchObject({
      PORT: 3210,
      HOST: '127.0.0.1',
      DB_PORT: 3307,
      DB_NAME: 'veilroom',
      BCRYPT_COST: 12,
      NODE_ENV: 'development',
    })
    expect(c.SESSION_SECRET.length).toBeGreaterThanOrEqual(16)
  })

  it('names the variable and the reason when a value is wrong', () => {
    expect(() => loadConfig({ PORT: 'eighty' })).toThrow(/PORT: /)
    expect(() => loadConfig({ PUBLIC_URL: 'not a url' })).toThrow(/PUBLIC_URL/)
    expect(() => loadConfig({ BCRYPT_COST: '8' })).toThrow(/BCRYPT_COST: at least 10/)
    expect(() => loadConfig({ DB_NAME: 'x; DROP' })).toThrow(/DB_NAME: letters, digits and _ only/)
  })

  it('requires a session secret in production', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(/SESSION_SECRET: required when NODE_ENV=production/)
    expect(loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'a'.repeat(32) }).SESSION_SECRET).toBe('a'.repeat(32))
  })
})
