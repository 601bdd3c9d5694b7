import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Locator } from 'playwright-core'
import * as Y from 'yjs'
import { movePoint } from '../../shared/room-doc/edits'
import { loopsOf } from '../../shared/room-doc/schema'
import { baseUrl, launchBrowser, type LaunchedBrowser } from '../helpers/browser'
import { connectDoc, connectStream, type DocClient } from '../helpers/live-clients'
import { apiSession, memberWithRole, type ApiSession } from './api-session'

// Issue 16 in the browser: an owner keeps the rooms list open while an editor moves a frame point
// through the sync socket and pins a comment; without a reload, the edited room goes to the top
// with the editor's name and what moved (server/modules/activity/frame-change.ts's wording), and
// its open pins count rises. Frame edits are stored after a quiet spell (activity-recorder.ts, 3 s),
// so the waits below allow for that.
const LIVE_MS = 20_000

/** The session cookie of an API session, for the node-side sync and stream clients. */
const cookieOf = async (s: ApiSession): Promise<string> =>
  (await s.http.storageState()).cookies.map((c) => `${c.name}=${c.value}`).join('; ')

describe('the rooms list shows where the work is, live', () => {
  let browser: LaunchedBrowser
  let owner: ApiSession
  let editor: ApiSession
  let editorDoc: DocClient | undefined
  const tag = Date.now()
  const edited = { id: '', name: `Sail over the yard ${tag}` }
  const newer = { id: '', name: `Tent by the pond ${tag}` }

  const row = (name: string): Locator => browser.page.getByTestId('rooms-table').locator('tbody tr', { hasText: name })
  const firstRow = (): Locator => browser.page.getByTestId('rooms-table').locator('tbody tr').first()

  beforeAll(async () => {
    owner = await apiSession()
    await owner.call('POST', '/api/auth/signup', {
      name: 'Imke Rooms',
      email: `rooms-owner-${tag}@example.test`,
      password: 'a long enough password',
    })
    const create = (name: string) =>
      owner.call<{ room: { id: string } }>('POST', '/api/rooms', { name, starter: 'sail' }).then((r) => r.room.id)
    edited.id = await create(edited.name)
    editor = await memberWithRole(owner, edited.id, 'editor', 'tobias')
    // created after the editor joined the first room, so it starts at the top of the list
    newer.id = await create(newer.name)
    browser = await launchBrowser()
    await browser.context.addCookies((await owner.http.storageState()).cookies)
    await browser.page.goto(`${baseUrl()}/rooms`)
    await row(edited.name).waitFor()
  })
  afterAll(async () => {
    editorDoc?.destroy()
    await browser?.close()
    await Promise.all([owner?.close(), editor?.close()])
  })

  it('lists the newest room first, the other with its last change', async () => {
    expect(await firstRow().textContent()).toContain(newer.name)
    expect(await row(edited.name).getByTestId('room-last-change').textContent()).toMatch(/Wren tobias joined the room/)
    expect(await row(edited.name).getByTestId('room-open-pins').textContent()).toBe('0')
  })

  it('counts the people who have the room open now, and forgets them when they leave', async () => {
    const here = row(edited.name).getByTestId('room-people')
    expect(await here.textContent()).toBe('0')
    const stream = connectStream(baseUrl(), await cookieOf(editor))
    try {
      const reply = await stream.emitWithAck('room:join', { roomId: edited.id })
      expect(reply).toMatchObject({ ok: true, role: 'editor' })
      await expect.poll(() => here.textContent(), { timeout: LIVE_MS }).toBe('1')
    } finally {
      stream.disconnect()
    }
    await expect.poll(() => here.textContent(), { timeout: LIVE_MS }).toBe('0')
  })

  it('an edit through the sync socket moves the room to the top, naming the editor and the point', async () => {
    editorDoc = connectDoc(baseUrl(), edited.id, await cookieOf(editor))
    await editorDoc.synced
    await expect.poll(() => loopsOf(editorDoc!.doc).length).toBeGreaterThan(0)
    const outer = loopsOf(editorDoc.doc).get(0)
    const first = (outer.get('points') as Y.Array<Y.Map<unknown>>).get(0)
    movePoint(editorDoc.doc, outer.get('id') as string, first.get('id') as string, {
      x: (first.get('x') as number) + 0.5,
    })
    // the list is not reloaded: rooms:changed brings the new activity
    await firstRow().filter({ hasText: edited.name }).waitFor({ timeout: LIVE_MS })
    expect(await firstRow().getByTestId('room-last-change').textContent()).toMatch(/^Wren tobias moved Outer P1/)
    // the server solved the edited frame: its settle state and a picture of the surface from above
    await expect.poll(() => firstRow().getByTestId('room-state').textContent(), { timeout: LIVE_MS }).toBe('Settled')
    const picture = firstRow().locator('img.thumb')
    await expect.poll(() => picture.evaluate((img) => (img as HTMLImageElement).naturalWidth)).toBeGreaterThan(0)
  })

  it('a pin raises the open count, and the owner’s own pin counts as theirs', async () => {
    const pin = { x: 1, y: 1, z: 1, docVersion: 0 }
    await editor.call('POST', `/api/rooms/${edited.id}/pins`, { ...pin, body: 'Check the low corner for ponding.' })
    const pins = row(edited.name).getByTestId('room-open-pins')
    await expect.poll(() => pins.textContent(), { timeout: LIVE_MS }).toBe('1')
    expect(await firstRow().getByTestId('room-last-change').textContent()).toMatch(/^Wren tobias pinned a comment/)
    await owner.call('POST', `/api/rooms/${edited.id}/pins`, { ...pin, body: 'Raise the mast by a little.' })
    await expect.poll(() => pins.textContent(), { timeout: LIVE_MS }).toBe('2 · 1 mine')
    // the room that saw no work stays below, as it was
    expect(await row(newer.name).getByTestId('room-open-pins').textContent()).toBe('0')
  })

  it('filters to the rooms where pins of mine are open', async () => {
    const { page } = browser
    await page.getByTestId('rooms-filter').click()
    await page.locator('.n-base-select-option', { hasText: 'Open pins of mine' }).click()
    await row(newer.name).waitFor({ state: 'detached' })
    expect(await page.getByTestId('rooms-table').locator('tbody tr').allTextContents()).toEqual([
      expect.stringContaining(edited.name),
    ])
  })
})
