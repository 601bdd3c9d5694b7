import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, launchBrowser, type LaunchedBrowser } from '../helpers/browser'
import { demoPassword } from './demo-accounts'
import { openRoomTab } from './room-tabs'

// What a signed-in editor must see comes from the demo seed (issue 2): the editor is a member of
// both demo rooms. The caution wording is the product brief's ("Cautions shown with results").
const EDITOR = 'editor@demo.veilroom.test'
const DEMO_ROOMS = ['Courtyard canopy — Example Yard A', 'Four-point shade sail — Example Terrace B']

describe('signing in as the demo editor', () => {
  let browser: LaunchedBrowser
  const foreignRequests: string[] = []

  beforeAll(async () => {
    const origin = new URL(baseUrl()).origin
    browser = await launchBrowser()
    // The client must work with no outside network: fonts and scripts all come from our server.
    browser.page.on('request', (req) => {
      const url = req.url()
      if (!url.startsWith(origin) && !url.startsWith('data:') && !url.startsWith('blob:')) foreignRequests.push(url)
    })
  })

  afterAll(async () => {
    await browser?.close()
  })

  it('sends a signed-out visitor to sign-in with the way back to the page asked for', async () => {
    const { page } = browser
    await page.goto(`${baseUrl()}/rooms/new`)
    await page.waitForURL((url) => url.pathname === '/sign-in')
    expect(new URL(page.url()).searchParams.get('redirect')).toBe('/rooms/new')
  })

  it('shows the server error above the form for a wrong password', async () => {
    const { page } = browser
    await page.fill('input[name=email]', EDITOR)
    await page.fill('input[name=password]', 'not-the-password')
    await page.click('button[type=submit]')
    const error = page.getByTestId('form-error')
    await error.waitFor()
    expect((await error.textContent())?.trim().length).toBeGreaterThan(0)
    expect(page.url()).toContain('/sign-in')
  })

  it('signs in, returns to the page asked for, and lists both demo rooms', async () => {
    const { page } = browser
    await page.fill('input[name=email]', EDITOR)
    await page.fill('input[name=password]', await demoPassword(EDITOR))
    await page.click('button[type=submit]')
    await page.waitForURL((url) => url.pathname === '/rooms/new')
    await page.goto(`${baseUrl()}/rooms`)
    const table = page.getByTestId('rooms-table')
    for (const name of DEMO_ROOMS) await table.getByText(name, { exact: true }).waitFor()
    expect(await table.getByText('Editor', { exact: true }).count()).toBe(2)
    // An editor may rename but not delete (owner only).
    expect(await table.getByRole('button', { name: 'Rename' }).count()).toBe(2)
    expect(await table.getByRole('button', { name: 'Delete' }).count()).toBe(0)
  })

  it('opens a room with its members, the workbench area and the caution note', async () => {
    const { page } = browser
    await page.getByRole('link', { name: DEMO_ROOMS[1] }).click()
    await page.getByTestId('room-page').waitFor()
    expect(await page.getByTestId('my-role').textContent()).toContain('Editor')
    // The live workbench replaces the placeholder slot of issue 2; either marks the workbench area.
    await page.locator('[data-testid=workbench], [data-testid=workbench-slot]').first().waitFor()
    // The note may appear more than once (beside the figures too); every copy carries the caution.
    const cautions = await page.getByTestId('caution-note').allTextContents()
    expect(cautions.length).toBeGreaterThan(0)
    for (const caution of cautions) {
      expect(caution).toContain('preliminary')
      expect(caution).toContain('qualified engineer')
    }
    await openRoomTab(page, 'members')
    await page
      .getByTestId('room-members')
      .getByText(/\(you\)$/)
      .waitFor()
    expect(await page.getByTestId('room-members').getByText('(you)').count()).toBe(1)
  })

  it('uses the bundled Work Sans font and asked nothing of other hosts', async () => {
    const { page } = browser
    expect(await page.evaluate('document.fonts.check(\'16px "Work Sans"\')')).toBe(true)
    expect(foreignRequests).toEqual([])
  })

  it('signs out from the account menu and lands on sign-in', async () => {
    const { page } = browser
    await page.getByTestId('account-menu').click()
    await page.getByText('Sign out', { exact: true }).click()
    await page.waitForURL((url) => url.pathname === '/sign-in')
    // The session is gone on the server too: a members-only page sends us back to sign-in.
    await page.goto(`${baseUrl()}/rooms/new`)
    await page.waitForURL((url) => url.pathname === '/sign-in' && url.searchParams.get('redirect') === '/rooms/new')
  })
})
