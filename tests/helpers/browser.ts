import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium, type BrowserContext, type Page } from 'playwright-core'

/** Debian's chromium; playwright-core downloads nothing here (see ../shared/STACK.md). */
export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium'

export interface LaunchedBrowser {
  context: BrowserContext
  page: Page
  /** Closes the browser and deletes its profile folder. */
  close: () => Promise<void>
}

/** Flags for headless Debian chromium: no sandbox (root in a container), no background traffic. */
export const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
]

/**
 * Headless chromium with a fresh profile in a temporary folder, so no cookie or cache survives
 * between runs. Background networking is off: a test sees only the requests the app makes.
 */
export async function launchBrowser(
  options: { viewport?: { width: number; height: number } } = {},
): Promise<LaunchedBrowser> {
  const profile = await mkdtemp(join(tmpdir(), 'veilroom-chromium-'))
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    viewport: options.viewport ?? { width: 1280, height: 800 },
    args: CHROMIUM_ARGS,
  })
  const page = context.pages()[0] ?? (await context.newPage())
  return {
    context,
    page,
    close: async () => {
      await context.close()
      await rm(profile, { recursive: true, force: true })
    },
  }
}

/**
 * The app under test; the test runner starts the server and sets BASE_URL. Inside vitest,
 * process.env.BASE_URL is overwritten with Vite's base path ("/"), so tests/browser/vitest.config.ts
 * copies the runner's value to VEILROOM_BASE_URL before that happens.
 */
export function baseUrl(): string {
  const url = [process.env.VEILROOM_BASE_URL, process.env.BASE_URL].find((u) => u && /^https?:\/\//.test(u))
  if (!url)
    throw new Error(
      'BASE_URL is not set to http(s)://…: browser tests need a running Veilroom server (npm test starts one)',
    )
  return url.replace(/\/$/, '')
}
