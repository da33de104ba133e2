import { defineConfig, mergeConfig } from 'vitest/config'
import viteConfig from './vite.config.ts'

// One run for every test: numerics (tests/shared), API (tests/server, real PostgreSQL),
// components (tests/src, happy-dom) and the browser (tests/e2e, Chromium).
// Files that need a DOM start with `// @vitest-environment happy-dom`.
export default mergeConfig(viteConfig, defineConfig({
  test: {
    environment: 'node',
    include: ['tests/**/*.spec.ts'],
    globalSetup: ['tests/helpers/global-setup.ts'],
    server: { deps: { inline: ['vuetify'] } },
    testTimeout: 60000,
    hookTimeout: 60000,
    pool: 'forks',
    maxWorkers: 2,
  },
}))
