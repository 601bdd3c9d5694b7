import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, launchBrowser, type LaunchedBrowser } from '../helpers/browser'
import { openRoomTab } from './room-tabs'

// A new user's first minutes, against the real server and the API contract of issue 2: sign-up
// errors arrive beside the field the server names (409 email_taken → field "email"); the creator of
// a room is its owner and may rename and delete it.

describe('a new user signs up and looks after a room of their own', () => {
  let browser: LaunchedBrowser
  const email = `new-${Date.now()}@example.test`
  const roomName = `Festival tent ${Date.now()}`

  beforeAll(async () => {
    browser = await launchBrowser()
  })
  afterAll(async () => {
    await browser?.close()
  })

  it('shows a taken e-mail beside the e-mail field', async () => {
    const { page } = browser
    await page.goto(`${baseUrl()}/sign-up`)
    await page.fill('input[name=name]', 'Nia New')
    await page.fill('input[name=email]', 'owner@demo.veilroom.test')
    await page.fill('input[name=password]', 'a long enough password')
    await page.click('button[type=submit]')
    const emailItem = page.locator('.n-form-item', { has: page.locator('input[name=email]') })
    await emailItem.locator('.n-form-item-feedback--error').waitFor()
    expect(await emailItem.textContent()).toMatch(/already/i)
  })

  it('refuses a short password before sending anything', async () => {
    const { page } = browser
    let posted = false
    page.on('request', (req) => {
      if (req.method() === 'POST' && req.url().endsWith('/api/auth/signup')) posted = true
    })
    await page.fill('input[name=email]', email)
    await page.fill('input[name=password]', 'short')
    await page.click('button[type=submit]')
    const passwordItem = page.locator('.n-form-item', { has: page.locator('input[name=password]') })
    expect(await passwordItem.locator('.n-form-item-feedback--error').textContent()).toContain('at least 10')
    expect(posted).toBe(false)
    page.removeAllListeners('request')
  })

  it('signs up, starts with no rooms, creates one and lands in it as owner', async () => {
    const { page } = browser
    await page.fill('input[name=password]', 'a long enough password')
    await page.click('button[type=submit]')
    await page.waitForURL((url) => url.pathname === '/rooms')
    await page.getByText('No rooms yet', { exact: false }).waitFor()
    await page.getByTestId('new-room').click()
    await page.fill('input[name=name]', roomName)
    await page.fill('textarea[name=description]', 'Twelve-metre round tent, one central mast.')
    await page.click('button[type=submit]')
    await page.getByTestId('room-page').waitFor()
    expect(await page.getByTestId('my-role').textContent()).toContain('Owner')
    // The members list loads on its own; wait for it rather than reading it once.
    await openRoomTab(page, 'members')
    await page.getByTestId('room-members').getByText('Nia New (you)').waitFor()
  })

  it('renames the room from the rooms table', async () => {
    const { page } = browser
    await page.getByRole('link', { name: 'Rooms', exact: true }).click()
    const row = page.locator('tr', { hasText: roomName })
    await row.getByRole('button', { name: 'Rename' }).click()
    const modal = page.locator('.n-modal')
    await modal.locator('input').fill(`${roomName}, revised`)
    await modal.getByRole('button', { name: 'Rename' }).click()
    await page.locator('tr', { hasText: `${roomName}, revised` }).waitFor()
  })

  it('deletes the room after confirming, and the server agrees it is gone', async () => {
    const { page } = browser
    await page.locator('tr', { hasText: roomName }).getByRole('button', { name: 'Delete' }).click()
    await page.getByRole('button', { name: 'Delete room' }).click()
    await page.getByText('No rooms yet', { exact: false }).waitFor()
    await page.reload()
    await page.getByText('No rooms yet', { exact: false }).waitFor()
    expect(await page.locator('tr', { hasText: roomName }).count()).toBe(0)
  })
})
