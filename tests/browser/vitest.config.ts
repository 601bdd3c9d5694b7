import { defineConfig } from 'vitest/config'

// Browser tests run one file at a time against one server (BASE_URL); run with
// `npx vitest run --config tests/browser/vitest.config.ts`.
export default defineConfig({
  test: {
    root: new URL('../..', import.meta.url).pathname,
    include: ['tests/browser/**/*.e2e.ts'],
    environment: 'node',
    fileParallelism: false,
    testTimeout: 60_000,
    hookTimeout: 60_000,
    // Vitest replaces process.env.BASE_URL with Vite's base ("/") inside tests; keep the server URL.
    env: { VEILROOM_BASE_URL: process.env.VEILROOM_BASE_URL ?? process.env.BASE_URL ?? '' },
  },
})
