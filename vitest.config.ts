import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'

const alias = {
  '#shared': fileURLToPath(new URL('./shared', import.meta.url)),
  '~': fileURLToPath(new URL('.', import.meta.url)),
}

// Two projects: pure unit tests, and the server suite (API tests against one built server
// and the private PostgreSQL, browser tests in Debian's Chromium). See DEVELOPERS.md.
export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' },
      },
      {
        resolve: { alias },
        test: {
          // API and browser tests share one built server and one test database.
          name: 'server',
          include: ['tests/api/**/*.test.ts', 'tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 180_000,
        },
      },
    ],
  },
})
