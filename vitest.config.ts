import { defineConfig } from 'vitest/config'
import vue from '@vitejs/plugin-vue'

// Three kinds of test, as DEVELOPERS.md explains:
//  unit       plain TypeScript (language, solver, helpers), node environment, fast
//  components Vue components in happy-dom
//  nuxt       routes of the built server against the real MariaDB, and the browser (Chromium) tests
export default defineConfig({
  test: {
    reporters: ['default', './tests/setup/summary-reporter.ts'],
    projects: [
      {
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts'],
          environment: 'node',
        },
      },
      {
        plugins: [vue()],
        test: {
          name: 'components',
          include: ['tests/components/**/*.test.ts'],
          environment: 'happy-dom',
        },
      },
      {
        test: {
          name: 'nuxt',
          include: ['tests/nuxt/**/*.test.ts', 'tests/e2e/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          // One database reset and one built server for all route and browser files.
          globalSetup: ['tests/setup/global-server.ts'],
          testTimeout: 60_000,
          hookTimeout: 180_000,
        },
      },
    ],
  },
})
