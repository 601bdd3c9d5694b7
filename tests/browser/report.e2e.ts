import { mkdirSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { baseUrl, launchBrowser, type LaunchedBrowser } from '../helpers/browser'
import { demoPassword } from './demo-accounts'
import { readPdf, type PdfPage } from './report-pdf'

// Issue 15: the printed report of each demo room, printed by Chromium to PDF on A4 and US Letter and
// read back with pdftotext (poppler-utils). The PDFs stay in the folder printed below, for a look.
const OWNER = 'owner@demo.veilroom.test'
const RUN = Date.now().toString(36)
const OUT = join(tmpdir(), `veilroom-report-${RUN}`)
const MM = 72 / 25.4
/** The report's page margins, left and right (src/lib/report/page-style.ts), in points. */
const SIDE_MARGIN = 14 * MM

type Reaction = [number, number, number, number, number]
interface Result {
  figures: { reactions: Reaction[] }
}
interface SnapshotFrame {
  loops: { role: string; points: { x: number; y: number; z: number }[] }[]
}

async function api<T>(page: Page, method: string, path: string, body?: unknown): Promise<{ status: number; json: T }> {
  return page.evaluate(
    async ({ method, path, body }) => {
      const headers: Record<string, string> = { 'content-type': 'application/json' }
      if (method !== 'GET')
        headers['x-csrf-token'] = ((await (await fetch('/api/auth/csrf')).json()) as { token: string }).token
      const res = await fetch(path, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) })
      return { status: res.status, json: await res.json().catch(() => null) }
    },
    { method, path, body },
  ) as Promise<{ status: number; json: T }>
}

/** A number as the report prints it: fixed decimals, never "-0.00". */
const fixed = (v: number, d: number): string => v.toFixed(d).replace(/^-(0\.?0*)$/, '$1')
const esc = (s: string): string => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')
/** The pages whose layout text matches. */
const pagesWith = (pages: PdfPage[], re: RegExp): number[] => pages.flatMap((p, i) => (re.test(p.text) ? [i] : []))

async function choose(page: Page, label: string): Promise<void> {
  await page.getByTestId('report-source-picker').click()
  await page.locator('.n-base-select-option').filter({ hasText: label }).first().click()
  await page.getByTestId('report-document').waitFor({ timeout: 45_000 })
}

async function printBoth(page: Page, name: string): Promise<Record<'A4' | 'Letter', PdfPage[]>> {
  const out = {} as Record<'A4' | 'Letter', PdfPage[]>
  for (const format of ['A4', 'Letter'] as const) {
    const path = join(OUT, `${name}-${format}.pdf`)
    await page.pdf({ path, format, printBackground: true })
    out[format] = await readPdf(path)
  }
  return out
}

/** Checks common to every printed report: header, caution and page number on each page, nothing past the side margins. */
function checkPages(pages: PdfPage[], roomName: string): void {
  expect(pages.length).toBeGreaterThan(1)
  pages.forEach((p, i) => {
    const flat = p.text.replace(/\s+/g, ' ')
    expect(flat, `page ${i + 1}: header`).toContain(roomName)
    expect(flat, `page ${i + 1}: caution`).toContain(
      'Preliminary form-finding result. Form-finding results are preliminary',
    )
    expect(flat, `page ${i + 1}: caution`).toContain('qualified engineer')
    expect(flat, `page ${i + 1}: page number`).toContain(`Page ${i + 1} of ${pages.length}`)
    const outside = p.words.filter(
      (w) =>
        w.xMin < SIDE_MARGIN - 1 || w.xMax > p.width - SIDE_MARGIN + 1 || w.yMin < 5 * MM || w.yMax > p.height - 5 * MM,
    )
    expect(
      outside.map((w) => `${w.text} @ ${w.xMin.toFixed(0)}–${w.xMax.toFixed(0)}`),
      `page ${i + 1}: words past the margins`,
    ).toEqual([])
  })
}

describe('printed report (issue 15)', () => {
  let browser: LaunchedBrowser
  let rooms: { id: string; name: string }[] = []

  beforeAll(async () => {
    mkdirSync(OUT, { recursive: true })
    console.log(`[report] PDFs are written to ${OUT}`)
    browser = await launchBrowser({ viewport: { width: 1280, height: 900 } })
    const { page } = browser
    await page.goto(`${baseUrl()}/sign-in`)
    await page.fill('input[name=email]', OWNER)
    await page.fill('input[name=password]', await demoPassword(OWNER))
    await page.click('button[type=submit]')
    await page.getByTestId('rooms-table').waitFor()
    const seedPath = '../../server/db/seed.ts'
    const { demoRooms } = (await import(/* @vite-ignore */ seedPath)) as { demoRooms: readonly { name: string }[] }
    const listed = (await api<{ rooms: { id: string; name: string }[] }>(page, 'GET', '/api/rooms')).json.rooms
    rooms = demoRooms.map((d) => listed.find((r) => r.name === d.name)!).filter(Boolean)
    expect(rooms).toHaveLength(demoRooms.length)
  })
  afterAll(async () => {
    await browser?.close()
  })

  it('offers the choice on the page itself, without showing any address syntax', async () => {
    const { page } = browser
    await page.goto(`${baseUrl()}/rooms/${rooms[0]!.id}/report`)
    await page.getByTestId('report-source-picker').waitFor()
    const text = (await page.getByTestId('report-page').textContent()) ?? ''
    expect(text).toContain('Choose one of the room')
    expect(text).not.toMatch(/\?[a-z]+=|snapshot=|&[a-z]+=|query/)
  })

  for (const index of [0, 1]) {
    it(`prints demo room ${index + 1} from a snapshot on A4 and Letter: inputs, frame points, forces, pins, caution`, async () => {
      const { page } = browser
      const room = rooms[index]!
      // Opening the room lets the solver settle its surface; then a pin with a reply and a snapshot.
      await page.goto(`${baseUrl()}/rooms/${room.id}`)
      await page.waitForFunction(
        () => document.querySelector('[data-testid=solver-status]')?.getAttribute('data-phase') === 'settled',
        null,
        { timeout: 60_000 },
      )
      const pinToken = `pin${RUN}`,
        replyToken = `reply${RUN}`
      const pinText = `Check the anchor plate at this corner (${pinToken}).`
      const pin = await api<{ pin: { id: string; author: { name: string } } }>(
        page,
        'POST',
        `/api/rooms/${room.id}/pins`,
        { x: 1, y: 1, z: 1, docVersion: 0, body: pinText },
      )
      expect(pin.status).toBe(201)
      const replyText = `Plate to follow the anchor table (${replyToken}).`
      expect(
        (await api(page, 'POST', `/api/rooms/${room.id}/pins/${pin.json.pin.id}/replies`, { body: replyText })).status,
      ).toBe(201)
      const name = `For checking ${RUN}`
      const note = `Issued to the checking engineer with the frame table, run ${RUN}.`
      const saved = await api<{ snapshot: { id: string } }>(page, 'POST', `/api/rooms/${room.id}/snapshots`, {
        name,
        note,
      })
      expect(saved.status).toBe(201)
      const sid = saved.json.snapshot.id
      const frame = (
        await api<{ snapshot: { frame: SnapshotFrame } }>(page, 'GET', `/api/rooms/${room.id}/snapshots/${sid}`)
      ).json.snapshot.frame
      const result = (await api<Result>(page, 'GET', `/api/rooms/${room.id}/snapshots/${sid}/surface`)).json

      await page.goto(`${baseUrl()}/rooms/${room.id}/report`)
      await choose(page, name)
      // Every open pin is numbered on the plan and listed once in the pins table.
      const openPins = (
        await api<{ pins: { resolved: boolean }[] }>(page, 'GET', `/api/rooms/${room.id}/pins?status=open`)
      ).json.pins.length
      expect(await page.getByTestId('report-plan-pin').count()).toBe(openPins)
      expect(await page.getByTestId('report-table-pins').locator('tbody tr').count()).toBe(openPins)
      const printed = await printBoth(page, `room${index + 1}-snapshot`)
      for (const [format, pages] of Object.entries(printed)) {
        checkPages(pages, room.name)
        const all = pages.map((p) => p.text).join('\n')
        expect(all, format).toContain(note)
        expect(all, format).toMatch(/Prestress, warp\s+\d+\.\d\d\s+kN\/m/)
        expect(all, format).toMatch(/Element size \(target edge length\)\s+\d+\.\d{3}\s+m/)
        expect(all, format).toMatch(/Solver residual \(normalised\)\s+\d\.\d\de[-+]\d+/)
        expect(all, format).toMatch(/Height contours every [\d.]+ m/)
        let hole = 0
        for (const loop of frame.loops) {
          const loopName = loop.role === 'outer' ? 'Outer' : `Hole ${++hole}`
          loop.points.forEach((p, i) => {
            const row = new RegExp(
              `${loopName} P${i + 1}\\s+${esc(fixed(p.x, 3))}\\s+${esc(fixed(p.y, 3))}\\s+${esc(fixed(p.z, 3))}\\s+${loopName} E${i + 1}`,
            )
            expect(pagesWith(pages, row), `${format}: frame point ${loopName} P${i + 1} on one page`).toHaveLength(1)
          })
        }
        for (const [l, p, fx, fy, fz] of result.figures.reactions) {
          const loopName =
            frame.loops[l]!.role === 'outer'
              ? 'Outer'
              : `Hole ${frame.loops.slice(0, l + 1).filter((x) => x.role === 'hole').length}`
          const h = Math.hypot(fx, fy)
          const cells = [fx, fy, fz, Math.hypot(h, fz)].map((v) => esc(fixed(v, 2)))
          const row = new RegExp(
            `${loopName} P${p + 1}\\s+${cells.join('\\s+')}\\s+${esc(fixed((Math.atan2(fz, h) * 180) / Math.PI, 1))}`,
          )
          expect(pagesWith(pages, row), `${format}: force at ${loopName} P${p + 1}`).toHaveLength(1)
        }
        // The pin's row (number, author, comment and reply) is not split across pages.
        const pinPages = pagesWith(pages, new RegExp(pinToken))
        expect(pinPages, `${format}: pin`).toHaveLength(1)
        const pinPage = pages[pinPages[0]!]!.text
        const author = esc(pin.json.pin.author.name.split(' ')[0]!)
        expect(pinPage).toMatch(
          new RegExp(
            `^\\s*\\d+\\s+1\\.00\\s+1\\.00\\s+1\\.00\\s+${author}\\s+\\d{4}-\\d\\d-\\d\\d \\d\\d:\\d\\d UTC`,
            'm',
          ),
        )
        expect(pinPage).toContain(replyToken)
      }
    }, 180_000)
  }

  it('prints the current settled state marked unsaved', async () => {
    const { page } = browser
    const room = rooms[1]!
    await page.goto(`${baseUrl()}/rooms/${room.id}/report`)
    await choose(page, 'Current settled state')
    expect(await page.getByTestId('report-source').textContent()).toMatch(/Unsaved/i)
    const { A4 } = await printBoth(page, 'current')
    checkPages(A4, room.name)
    expect(A4[0]!.text).toMatch(/current state, unsaved/)
    expect(A4.map((p) => p.text).join('\n')).toMatch(/Outer P1\s+-?\d+\.\d{3}/)
  }, 120_000)
})
