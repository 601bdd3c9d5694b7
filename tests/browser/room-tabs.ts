import type { Page } from 'playwright-core'

/**
 * Opens a tab of the room's right-hand panel (points, figures, settings, pins, snapshots, members,
 * files). Naive UI marks each tab with its pane's name in `data-name`.
 */
export async function openRoomTab(page: Page, name: string): Promise<void> {
  await page.locator(`[data-testid=workbench] .n-tabs-tab[data-name="${name}"]`).first().click()
}
