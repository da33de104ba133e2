// The harness shared by the browser tests: the built client (dist/) served by an in-process app on
// its own database with the demo seed, Debian's Chromium via playwright-core on a temp profile, the
// page's errors collected, failure screenshots in out/e2e/, and the demo sign-in form.
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { chromium, type BrowserContext, type Page } from 'playwright-core'
import { startTestApp, type TestApp } from './app.ts'

const root = resolve(import.meta.dirname, '../..')
/** Where the browser tests leave their screenshots. */
export const shots = join(root, 'out/e2e')
/** The demo users' password (scripts/seed.ts). */
export const DEMO_PASSWORD = 'starsway-demo'

export interface BrowserOptions {
  /** Folder of the built client (default dist/). */
  distDir?: string
  /** Default time limit of page actions in ms (default 30000). */
  timeout?: number
  viewport?: { width: number, height: number }
}

export interface BrowserHarness {
  app: TestApp
  context: BrowserContext
  page: Page
  /** Uncaught errors thrown in the page. */
  pageErrors: string[]
  /** Console errors (a signed-out `me` logs a 401, so these are reported on failure, not asserted). */
  consoleErrors: string[]
  /** Runs a browser scenario; on failure leaves a screenshot and the page's errors in out/e2e/. */
  scenario(name: string, body: () => Promise<void>): Promise<void>
  /** Fills and submits the sign-in form already on the page. */
  signIn(email: string, password?: string): Promise<void>
  /** Closes the browser, removes its profile and stops the app. */
  close(): Promise<void>
}

/** Starts the seeded, listening test app and a headless Chromium with one page on it. */
export async function openBrowser(options: BrowserOptions = {}): Promise<BrowserHarness> {
  const dist = options.distDir ?? join(root, 'dist')
  if (!existsSync(join(dist, 'index.html'))) throw new Error('dist/ is missing: run `npx vite build` first (the test command does)')
  const app = await startTestApp({ seed: true, listen: true, distDir: dist })
  let profile: string | undefined
  let context: BrowserContext | undefined
  const close = async () => {
    await context?.close()
    if (profile) rmSync(profile, { recursive: true, force: true })
    await app.close()
  }
  try {
    profile = mkdtempSync(join(tmpdir(), 'starsway-pw-'))
    context = await chromium.launchPersistentContext(profile, {
      executablePath: '/usr/bin/chromium', headless: true, viewport: options.viewport ?? { width: 1280, height: 900 },
      args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
        '--disable-component-update', '--disable-sync'],
    })
  } catch (error) {
    await close().catch(() => {})
    throw error
  }
  const page = context.pages()[0] ?? await context.newPage()
  page.setDefaultTimeout(options.timeout ?? 30000)
  const pageErrors: string[] = []
  const consoleErrors: string[] = []
  page.on('pageerror', (e) => pageErrors.push(e.message))
  page.on('console', (m) => { if (m.type() === 'error') consoleErrors.push(m.text()) })

  return {
    app, context, page, pageErrors, consoleErrors, close,
    async scenario(name, body) {
      try {
        await body()
      } catch (error) {
        mkdirSync(shots, { recursive: true })
        await page.screenshot({ path: join(shots, `${name}-failure.png`), fullPage: true }).catch(() => {})
        throw new Error(`${(error as Error).message}\nat ${page.url()}; page errors: ${JSON.stringify(pageErrors)}; console errors: ${JSON.stringify(consoleErrors)}`, { cause: error })
      }
    },
    async signIn(email, password = DEMO_PASSWORD) {
      await page.locator('input[name="email"]').fill(email)
      await page.locator('input[name="password"]').fill(password)
      await page.locator('[data-test="sign-in-submit"]').click()
      // Signed in once the app has left the form; a refusal shows its alert instead, which is the failure.
      const error = page.locator('[data-test="sign-in-error"]')
      const left = page.waitForURL((url) => !url.pathname.startsWith('/sign-in'))
      const refused = error.waitFor().then(async () => { throw new Error(`sign-in refused: ${await error.innerText()}`) })
      await Promise.race([left, refused])
      refused.catch(() => {})
    },
  }
}
