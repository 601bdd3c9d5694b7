import type { Page } from 'playwright-core'

/**
 * Header words broken over more than one line ("N/a/m/e" in a column too narrow for it): each word
 * of every visible table header is measured as a DOM Range; a word whose boxes sit on more than one
 * line did not fit its cell. Runs in the page.
 */
export function brokenHeaderWords(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const found: string[] = []
    for (const th of document.querySelectorAll<HTMLElement>('th')) {
      if (th.offsetParent === null) continue // inside a hidden tab
      const walker = document.createTreeWalker(th, NodeFilter.SHOW_TEXT)
      for (let node = walker.nextNode(); node; node = walker.nextNode()) {
        const text = node.textContent ?? ''
        for (const m of text.matchAll(/\S+/g)) {
          const range = document.createRange()
          range.setStart(node, m.index)
          range.setEnd(node, m.index + m[0].length)
          const lines = new Set([...range.getClientRects()].filter((r) => r.width > 0).map((r) => Math.round(r.top)))
          if (lines.size > 1)
            found.push(
              `header "${th.textContent?.trim()}": "${m[0]}" broken over ${lines.size} lines (cell ${th.clientWidth} px wide)`,
            )
        }
      }
    }
    return found
  })
}

/** Pixels by which the page is wider than the window (a layout that does not narrow with it). */
export function sidewaysOverflow(page: Page): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)
}

/**
 * Collects what a person would see go wrong on a page: console errors, uncaught exceptions,
 * requests that failed or were answered with 4xx/5xx. `where` labels each entry.
 */
export function watchPage(page: Page, where: () => string, into: string[]): void {
  page.on('console', (msg) => {
    if (msg.type() === 'error') into.push(`${where()}: console error: ${msg.text()}`)
  })
  page.on('pageerror', (err) => into.push(`${where()}: uncaught: ${err.message}`))
  page.on('requestfailed', (req) =>
    into.push(`${where()}: request failed: ${req.method()} ${req.url()} (${req.failure()?.errorText})`),
  )
  page.on('response', (res) => {
    if (res.status() >= 400) into.push(`${where()}: ${res.status()} for ${res.request().method()} ${res.url()}`)
  })
}

/**
 * Tracks the page's requests so a test can wait until none is in flight. socket.io's long-polling
 * requests are left out: they stay open by design until the socket upgrades.
 */
export function trackRequests(page: Page): { quiet: (ms?: number) => Promise<void> } {
  const open = new Set<unknown>()
  const counted = (url: string) => !url.includes('/socket.io/')
  page.on('request', (r) => counted(r.url()) && open.add(r))
  page.on('requestfinished', (r) => open.delete(r))
  page.on('requestfailed', (r) => open.delete(r))
  return {
    /** Resolves once no request has been in flight for `ms` (checked every 50 ms). */
    quiet: async (ms = 300) => {
      let since = Date.now()
      while (Date.now() - since < ms) {
        if (open.size > 0) since = Date.now()
        await page.waitForTimeout(50)
      }
    },
  }
}

/** Waits until layout has followed a viewport change (two animation frames and the resize observers). */
export async function settleLayout(page: Page): Promise<void> {
  await page.evaluate(
    () =>
      new Promise<void>((resolve) =>
        requestAnimationFrame(() => requestAnimationFrame(() => setTimeout(resolve, 120))),
      ),
  )
}
