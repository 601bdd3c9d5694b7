import { mkdir } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { baseUrl, CHROMIUM_ARGS, CHROMIUM_PATH } from '../helpers/browser'
import { demoPassword } from './demo-accounts'
import { apiSession, inviteToken, memberWithRole, signedIn, type ApiSession } from './api-session'
import { brokenHeaderWords, settleLayout, sidewaysOverflow, trackRequests, watchPage } from './screen-checks'

// Issue 14: every route at three working widths, for every role and signed out. A route fails on
// a console error, an uncaught exception, a failed or 4xx/5xx request, a table header word broken
// over lines, or a page wider than the window. One browser, one context per role; each route is
// loaded once and then resized, as a person does who turns a tablet or narrows a window.

const WIDTHS = [
  { width: 1440, height: 900 },
  { width: 1024, height: 768 },
  { width: 820, height: 1180 },
] as const
const ROOM_TABS = ['points', 'figures', 'settings', 'pins', 'snapshots', 'members', 'files'] as const
// A screenshot of the room costs seconds on a loaded machine (software WebGL): the list tabs are
// photographed at every width, the others at the first; every tab is checked at every width.
const LIST_TABS: ReadonlySet<string> = new Set(['points', 'pins', 'snapshots', 'members'])
const shotsDir =
  process.env.SCREENS_DIR ??
  join(tmpdir(), `veilroom-screens-${new Date().toISOString().replace(/\D/g, '').slice(0, 14)}`)

interface Route {
  name: string
  path: string
  /** Shown once the page has loaded what it needs. */
  ready: string
  tabs?: readonly string[]
}

let browser: Browser
let owner: ApiSession
const sessions = new Map<string, ApiSession>()
let roomId = ''
let inviteLink = ''
let snapshotIds: string[] = []

beforeAll(async () => {
  await mkdir(shotsDir, { recursive: true })
  console.log(`[screens] screenshots in ${shotsDir}`)
  browser = await chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_ARGS })
  owner = await signedIn('owner@demo.veilroom.test', await demoPassword('owner@demo.veilroom.test'))
  const { rooms } = await owner.call<{ rooms: { id: string; name: string }[] }>('GET', '/api/rooms')
  roomId = rooms.find((r) => /shade sail/i.test(r.name))?.id ?? rooms[0]!.id
  sessions.set('owner', owner)
  for (const role of ['editor', 'reviewer'] as const) {
    const email = `${role}@demo.veilroom.test`
    sessions.set(role, await signedIn(email, await demoPassword(email)))
  }
  // The demo has no viewer: one joins through a real invite.
  sessions.set('viewer', await memberWithRole(owner, roomId, 'viewer', 'screens-viewer'))
  // A pending invite to preview, and two snapshots to compare.
  const invitee = `screens-invitee-${Date.now()}@example.test`
  await owner.call('POST', `/api/rooms/${roomId}/invites`, { email: invitee, role: 'reviewer' })
  // The dev mailbox shows mail only to its addressee: the invitee signs up to read the link (and does not accept it).
  const reader = await apiSession()
  await reader.call('POST', '/api/auth/signup', {
    name: 'Wren Invitee',
    email: invitee,
    password: 'a long enough password',
  })
  inviteLink = `/invite/${await inviteToken(reader, invitee)}`
  await reader.close()
  const { snapshots } = await owner.call<{ snapshots: { id: string }[] }>('GET', `/api/rooms/${roomId}/snapshots`)
  while (snapshots.length < 2) {
    const { snapshot } = await owner.call<{ snapshot: { id: string } }>('POST', `/api/rooms/${roomId}/snapshots`, {
      name: `Screens check ${snapshots.length + 1}`,
    })
    snapshots.unshift(snapshot)
  }
  snapshotIds = snapshots.slice(0, 2).map((s) => s.id)
}, 120_000)

afterAll(async () => {
  for (const s of sessions.values()) await s.close()
  await browser?.close()
})

function memberRoutes(): Route[] {
  return [
    { name: 'rooms', path: '/rooms', ready: '[data-testid=rooms-table]' },
    { name: 'new-room', path: '/rooms/new', ready: 'form' },
    { name: 'room', path: `/rooms/${roomId}`, ready: 'canvas[data-testid=viewport-canvas]', tabs: ROOM_TABS },
    { name: 'compare-empty', path: `/rooms/${roomId}/compare`, ready: '[data-testid=compare-pickers]' },
    {
      name: 'compare',
      path: `/rooms/${roomId}/compare?a=${snapshotIds[1]}&b=${snapshotIds[0]}`,
      ready: 'canvas[data-testid=compare-b]',
    },
    { name: 'report', path: `/rooms/${roomId}/report`, ready: '[data-testid=report-page]' },
    { name: 'invite', path: inviteLink, ready: '[data-testid=invite-room]' },
    { name: 'mailbox', path: '/dev/mailbox', ready: '[data-testid=mailbox]' },
    { name: 'not-found', path: '/no-such-page', ready: 'main' },
  ]
}
const guestRoutes = (): Route[] => [
  { name: 'sign-in', path: '/sign-in', ready: 'form' },
  { name: 'sign-up', path: '/sign-up', ready: 'form' },
  { name: 'invite', path: inviteLink, ready: '[data-testid=invite-room]' },
  { name: 'not-found', path: '/no-such-page', ready: 'main' },
]

/** Opens each route once, then checks and photographs it at every width (and each tab of the room). */
async function visitAll(who: string, context: BrowserContext, routes: Route[]): Promise<string[]> {
  const problems: string[] = []
  for (const route of routes) {
    let where = `${who} ${route.name}`
    const page: Page = await context.newPage()
    watchPage(page, () => where, problems)
    const requests = trackRequests(page)
    const t0 = Date.now()
    await page.setViewportSize(WIDTHS[0])
    await page.goto(baseUrl() + route.path)
    await page.locator(route.ready).first().waitFor({ timeout: 30_000 })
    await requests.quiet()
    const t1 = Date.now()
    // Width outside, tabs inside: a resize re-renders the 3D view, a tab switch does not.
    for (const size of WIDTHS) {
      await page.setViewportSize(size)
      for (const tab of route.tabs ?? [null]) {
        if (tab) await page.locator(`[data-testid=workbench] .n-tabs-tab[data-name="${tab}"]`).first().click()
        where = `${who} ${route.name}${tab ? `#${tab}` : ''} @${size.width}`
        await settleLayout(page)
        for (const broken of await brokenHeaderWords(page)) problems.push(`${where}: ${broken}`)
        const overflow = await sidewaysOverflow(page)
        if (overflow > 0) problems.push(`${where}: the page is ${overflow} px wider than the window`)
        if (!tab || LIST_TABS.has(tab) || size === WIDTHS[0] || process.env.SCREENS_ALL) {
          await page.screenshot({
            path: join(shotsDir, `${who}-${route.name}${tab ? `-${tab}` : ''}-${size.width}.png`),
          })
        }
      }
    }
    if (process.env.SCREENS_TIMING)
      console.log(`[screens] ${who} ${route.name}: load ${t1 - t0} ms, checks ${Date.now() - t1} ms`)
    page.removeAllListeners()
    await page.close()
  }
  return problems
}

describe('every screen at working widths and from every door', () => {
  it.each(['owner', 'editor', 'reviewer', 'viewer'])(
    'as %s: no errors, no failed requests, no broken headers',
    async (role) => {
      const context = await browser.newContext({ storageState: await sessions.get(role)!.http.storageState() })
      try {
        expect(await visitAll(role, context, memberRoutes())).toEqual([])
      } finally {
        await context.close()
      }
    },
    600_000,
  )

  it('signed out: the public pages', async () => {
    const context = await browser.newContext()
    try {
      expect(await visitAll('guest', context, guestRoutes())).toEqual([])
    } finally {
      await context.close()
    }
  }, 300_000)
})
