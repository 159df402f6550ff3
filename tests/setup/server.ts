/**
 * Connects a test file to the one built server the global setup started.
 * Call `await useBuiltServer()` at the top of a file in tests/nuxt or
 * tests/e2e; then @nuxt/test-utils' `url`, `$fetch` and `createPage` work.
 */
import { inject } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'

/** Debian's Chromium through playwright-core (never a downloaded browser). */
export const CHROMIUM_OPTIONS = {
  type: 'chromium' as const,
  launch: {
    executablePath: '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking',
      '--disable-component-update', '--disable-sync', '--no-first-run'],
  },
}

export async function useBuiltServer(): Promise<void> {
  await setup({ host: inject('baseURL'), browserOptions: CHROMIUM_OPTIONS })
}
