import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { baseUrl, launchBrowser, type LaunchedBrowser } from '../helpers/browser'
import { demoPassword } from './demo-accounts'
import { openRoomTab } from './room-tabs'

// Issue 5 end to end, two people in two browsers: the owner invites a new address, the guest signs
// up, finds the mail in their dev mailbox, signs in through the link and accepts, pins a comment, the owner
// replies and resolves (seen live by the guest), saves two snapshots and compares them.
const OWNER = 'owner@demo.veilroom.test'
const ROOM = 'Four-point shade sail — Example Terrace B'
// Unique per run, so the test also passes against a server that has seen earlier runs.
const RUN = Date.now().toString(36)
const GUEST = `guest-${RUN}@studio.veilroom.test`
const GUEST_PASSWORD = 'tensioned-guest-2026'
const PIN_TEXT = `Low point by the north anchor: will this pond? (${RUN})`
const BEFORE = `Sail before review ${RUN}`
const AFTER = `Sail after review ${RUN}`

/** POST/PATCH from inside the page, with the session cookie and a CSRF token, like the app does. */
async function apiCall(
  page: Page,
  method: string,
  path: string,
  body: unknown,
): Promise<{ status: number; json: unknown }> {
  return page.evaluate(
    async ({ method, path, body }) => {
      const { token } = (await (await fetch('/api/auth/csrf')).json()) as { token: string }
      const res = await fetch(path, {
        method,
        headers: { 'content-type': 'application/json', 'x-csrf-token': token },
        body: JSON.stringify(body),
      })
      return { status: res.status, json: await res.json().catch(() => null) }
    },
    { method, path, body },
  )
}

/** Share of a canvas's pixels that differ clearly from the page background (#f7f4ee). */
async function paintedShare(page: Page, testId: string): Promise<number> {
  return page.evaluate((id) => {
    const c = document.querySelector(`[data-testid="${id}"]`) as HTMLCanvasElement | null
    if (!c) return -1
    const t = document.createElement('canvas')
    t.width = c.width
    t.height = c.height
    const g = t.getContext('2d')!
    g.drawImage(c, 0, 0)
    const d = g.getImageData(0, 0, t.width, t.height).data
    let painted = 0
    for (let i = 0; i < d.length; i += 4)
      if (Math.abs(d[i]! - 0xf7) + Math.abs(d[i + 1]! - 0xf4) + Math.abs(d[i + 2]! - 0xee) > 30) painted++
    return painted / (d.length / 4)
  }, testId)
}

describe('team work: invite, pins, snapshots', () => {
  let owner: LaunchedBrowser
  let guest: LaunchedBrowser
  let roomId = ''
  let inviteLink = ''

  beforeAll(async () => {
    owner = await launchBrowser({ viewport: { width: 1400, height: 1000 } })
    guest = await launchBrowser({ viewport: { width: 1400, height: 1000 } })
  })
  afterAll(async () => {
    await owner?.close()
    await guest?.close()
  })

  it('the owner invites a new address from the members panel', async () => {
    const { page } = owner
    await page.goto(`${baseUrl()}/sign-in`)
    await page.fill('input[name=email]', OWNER)
    await page.fill('input[name=password]', await demoPassword(OWNER))
    await page.click('button[type=submit]')
    await page.getByTestId('rooms-table').getByRole('link', { name: ROOM }).click()
    await page.getByTestId('room-page').waitFor()
    roomId = new URL(page.url()).pathname.split('/').pop()!
    await openRoomTab(page, 'members')
    const form = page.getByTestId('invite-form')
    await form.locator('input[name=invite-email]').fill(GUEST)
    await page.getByTestId('send-invite').click()
    await page.getByTestId('pending-invites').getByText(GUEST).waitFor()
  })

  it('the guest signs up and finds the invite mail in their own dev mailbox; the owner cannot read it', async () => {
    const { page } = guest
    await page.goto(`${baseUrl()}/sign-up`)
    await page.fill('input[name=name]', 'Guest Reviewer')
    await page.fill('input[name=email]', GUEST)
    await page.fill('input[name=password]', GUEST_PASSWORD)
    await page.click('button[type=submit]')
    await page.waitForURL(/\/rooms$/)
    await page.goto(`${baseUrl()}/dev/mailbox`)
    const mail = page.getByTestId('mail-message').filter({ hasText: GUEST }).first()
    await mail.waitFor()
    inviteLink = (await mail.getByTestId('mail-link').first().getAttribute('href')) ?? ''
    expect(inviteLink).toMatch(/\/invite\/[A-Za-z0-9_-]{43}$/)
    // The mailbox shows each person only the mail addressed to them (issue 12, item 2).
    const ownerSees = await owner.page.evaluate(async () =>
      ((await (await fetch('/api/dev/mailbox')).json()) as { messages: { to: string }[] }).messages.map((m) => m.to),
    )
    expect(ownerSees.filter((to) => to.includes(GUEST))).toEqual([])
  })

  it('the guest, signed out, opens the link, signs in through it, comes back and joins as reviewer', async () => {
    const { page } = guest
    expect((await apiCall(page, 'POST', '/api/auth/signout', {})).status).toBe(204)
    // PUBLIC_URL may differ from the test server's address: keep the path, use the server under test.
    await page.goto(`${baseUrl()}${new URL(inviteLink).pathname}`)
    expect(await page.getByTestId('invite-room').textContent()).toBe(ROOM)
    await page.getByTestId('invite-sign-in').click()
    await page.fill('input[name=email]', GUEST)
    await page.fill('input[name=password]', GUEST_PASSWORD)
    await page.click('button[type=submit]')
    await page.getByTestId('accept-invite').click()
    await page.waitForURL(new RegExp(`/rooms/${roomId}$`))
    expect(await page.getByTestId('my-role').textContent()).toContain('Reviewer')
  })

  it('the used link now says so', async () => {
    const { page } = guest
    const probe = await guest.context.newPage()
    await probe.goto(`${baseUrl()}${new URL(inviteLink).pathname}`)
    expect(await probe.getByTestId('invite-problem').textContent()).toContain('already been used')
    await probe.close()
    await page.bringToFront()
  })

  it('the guest pins a comment and the owner sees it arrive live', async () => {
    await owner.page.goto(`${baseUrl()}/rooms/${roomId}`)
    await openRoomTab(owner.page, 'pins')
    await owner.page.getByTestId('pins-panel').waitFor()
    // Clicking the 3D surface is the workbench's job; the pin goes through the same API call.
    const created = await apiCall(guest.page, 'POST', `/api/rooms/${roomId}/pins`, {
      x: 1.5,
      y: 2,
      z: 2.2,
      docVersion: 0,
      body: PIN_TEXT,
    })
    expect(created.status).toBe(201)
    const card = owner.page.getByTestId('pin-card').filter({ hasText: PIN_TEXT })
    await card.waitFor({ timeout: 15_000 })
  })

  it('the owner replies and resolves; the guest sees both live', async () => {
    const card = owner.page.getByTestId('pin-card').filter({ hasText: PIN_TEXT })
    await card.locator('input[name=pin-reply]').fill('Raised the anchor by 0.4 m; please check again.')
    await card.getByTestId('send-reply').click()
    await card.getByTestId('pin-reply').filter({ hasText: 'Raised the anchor' }).waitFor()
    await card.getByTestId('toggle-resolved').click()
    // The panel shows open pins by default: a resolved pin leaves the list.
    await card.waitFor({ state: 'detached' })
    await owner.page.getByTestId('pins-resolved').click()
    await owner.page.getByTestId('pin-card').filter({ hasText: PIN_TEXT }).getByText('Resolved').waitFor()

    await openRoomTab(guest.page, 'pins')
    await guest.page.getByTestId('pins-resolved').click()
    const seen = guest.page.getByTestId('pin-card').filter({ hasText: PIN_TEXT })
    await seen.getByTestId('pin-reply').filter({ hasText: 'Raised the anchor' }).waitFor({ timeout: 15_000 })
    // Reviewers comment but do not resolve (server/modules/pins/README.md).
    expect(await seen.getByTestId('toggle-resolved').count()).toBe(0)
  })

  async function saveSnapshot(page: Page, name: string): Promise<void> {
    // The server refuses (409 'no_surface') until the room's surface has settled: try for a minute.
    for (let attempt = 0; attempt < 30; attempt++) {
      await page.getByTestId('open-save-snapshot').click()
      const dialog = page.getByTestId('save-snapshot-dialog')
      await dialog.locator('input[name=snapshot-name]').fill(name)
      await page.getByTestId('save-snapshot').click()
      const error = dialog.getByTestId('snapshot-error')
      const outcome = await Promise.race([
        dialog.waitFor({ state: 'detached', timeout: 15_000 }).then(() => 'saved'),
        error.waitFor({ timeout: 15_000 }).then(() => 'refused'),
      ])
      if (outcome === 'saved') return
      const reason = (await error.textContent()) ?? ''
      if (!/settl/i.test(reason)) throw new Error(`saving snapshot "${name}" was refused: ${reason}`)
      await page.keyboard.press('Escape')
      await page.waitForTimeout(2000)
    }
    throw new Error(`snapshot "${name}" could not be saved within a minute`)
  }

  it('the owner saves two snapshots and they are listed', async () => {
    const { page } = owner
    await openRoomTab(page, 'snapshots')
    await saveSnapshot(page, BEFORE)
    await saveSnapshot(page, AFTER)
    const table = page.getByTestId('snapshots-table')
    await table.getByText(BEFORE).waitFor()
    await table.getByText(AFTER).waitFor()
  })

  it('compares the two snapshots: both views drawn, figures unchanged for an unchanged frame', async () => {
    const { page } = owner
    const table = page.getByTestId('snapshots-table')
    for (const name of [BEFORE, AFTER]) {
      await table.locator('tr', { hasText: name }).locator('.n-checkbox').click()
    }
    await page.getByTestId('compare-snapshots').click()
    await page.waitForURL(/\/compare\?a=.+&b=.+/)
    await page.getByTestId('figure-diff').waitFor()
    // polled until drawn (the surfaces load after the page), not a guessed sleep
    await expect.poll(() => paintedShare(page, 'compare-a'), { timeout: 15_000 }).toBeGreaterThan(0.02)
    await expect.poll(() => paintedShare(page, 'compare-b'), { timeout: 15_000 }).toBeGreaterThan(0.02)
    // Both snapshots hold the same settled surface: every difference is zero.
    const areaDiff = await page.locator('[data-key=area] td').nth(2).textContent()
    expect(areaDiff?.trim()).toBe('0.00 m²')
    await page.getByTestId('distance-legend').waitFor()
    expect(await page.getByTestId('caution-note').textContent()).toContain('qualified engineer')
  })

  it('prints a report of a snapshot with its drawings, figures and the caution', async () => {
    const { page } = owner
    const a = new URL(page.url()).searchParams.get('a')
    await page.goto(`${baseUrl()}/rooms/${roomId}/report?snapshot=${a}`)
    // Loading the mesh and drawing the views can be slow on a busy machine.
    await page.getByTestId('report-document').waitFor({ timeout: 45_000 })
    expect(await page.getByTestId('report-shaded').locator('path').count()).toBeGreaterThan(10)
    expect(await page.getByTestId('report-snapshot').textContent()).toBe(BEFORE)
    expect(await page.getByTestId('report-table-figures').textContent()).toContain('Fabric area')
    expect(await page.getByTestId('caution-note').first().textContent()).toContain('preliminary')
    // Print CSS drops the app's top bar from the PDF.
    await page.emulateMedia({ media: 'print' })
    expect(await page.locator('header.top-bar').isVisible()).toBe(false)
  })
})
