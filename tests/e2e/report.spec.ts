// Browser test of the review of a report against the built client (dist/) and the real API: the
// demo analyst freezes the demo solution of "Vela Sorrel" (two planets fitted from start values near
// fixtures/demo/README.md's P = 12.4 d and 187 d) and shares it with the demo reviewer; the reviewer
// opens the e-mailed link, signs in, comments and approves; the analyst sees the approval.
// Debian's Chromium via playwright-core; the app runs in-process on its own database.
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { chromium, type BrowserContext, type Page } from 'playwright-core'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn } from '../server/client.ts'

const root = resolve(import.meta.dirname, '../..')
const dist = process.env.STARSWAY_DIST ?? join(root, 'dist')
const shots = join(root, 'out/e2e')
const ANALYST = 'tomas.analyst@lanternfield.test'
const REVIEWER = 'ines.reviewer@lanternfield.test'
const SPEC = { planets: [{ period: 12.4, K: 9, e: 0.1, omegaDeg: 40 }, { period: 187, K: 14, e: 0.25, omegaDeg: 210 }], trend: 'none' }

let app: TestApp
let context: BrowserContext
let page: Page
let profile: string
const pageErrors: string[] = []

beforeAll(async () => {
  if (!existsSync(join(dist, 'index.html'))) throw new Error('dist/ is missing: run `npx vite build` first (the test command does)')
  app = await startTestApp({ seed: true, listen: true, distDir: dist })
  // the demo solution: the two-planet model fitted through the API
  const analyst = await signIn(app.app, ANALYST)
  const starId = app.seed!.starIds!['Vela Sorrel']!
  const model = (await analyst.post(`/api/stars/${starId}/models`, { name: 'Demo solution', spec: SPEC }).expect(201)).body.id
  await analyst.post(`/api/models/${model}/fit`, {}).expect(200)
  profile = mkdtempSync(join(tmpdir(), 'starsway-pw-'))
  context = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium', headless: true, viewport: { width: 1280, height: 900 },
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
  page = context.pages()[0] ?? await context.newPage()
  page.setDefaultTimeout(30000)
  page.on('pageerror', (e) => pageErrors.push(e.message))
}, 120000)

afterAll(async () => {
  await context?.close()
  if (profile) rmSync(profile, { recursive: true, force: true })
  await app?.close()
})

async function scenario(name: string, body: () => Promise<void>) {
  try {
    await body()
  } catch (error) {
    mkdirSync(shots, { recursive: true })
    await page.screenshot({ path: join(shots, `${name}-failure.png`), fullPage: true }).catch(() => {})
    throw new Error(`${(error as Error).message}\nat ${page.url()}; page errors: ${JSON.stringify(pageErrors)}`, { cause: error })
  }
}

async function signInAs(email: string) {
  await page.locator('input[name="email"]').fill(email)
  await page.locator('input[name="password"]').fill('starsway-demo')
  await page.locator('[data-test="sign-in-submit"]').click()
}

describe('a report reviewed in the browser', () => {
  it('analyst freezes and shares; reviewer opens the e-mailed link, comments and approves; analyst sees the approval', () => scenario('report', async () => {
    await page.goto(`${app.baseUrl}/stars`, { waitUntil: 'domcontentloaded' })
    await signInAs(ANALYST)
    await page.locator('[data-test="star-table"] tbody a', { hasText: 'Vela Sorrel' }).click()
    await page.locator('[data-test="star-name"]', { hasText: 'Vela Sorrel' }).waitFor()
    await page.locator('[data-test="freeze-model"]').click()
    await page.locator('.v-overlay .v-list-item', { hasText: 'Demo solution' }).click()
    await page.locator('[data-test="freeze-report"]').click()
    await page.locator('[data-test="report-title"]', { hasText: 'Vela Sorrel: Demo solution' }).waitFor()
    await page.locator('[data-test="param-b.period"]').waitFor()
    expect(await page.locator('[data-test="export-pdf"]').getAttribute('href')).toMatch(/\/api\/reports\/\d+\/versions\/1\/pdf$/)

    await page.locator('[data-test="open-share"]').click()
    await page.locator('[data-test="share-email"] input').fill(REVIEWER)
    await page.locator('[data-test="share-send"]').click()
    await page.locator('[data-test="share-done"]', { hasText: 'Ines Reviewer' }).waitFor()

    const mail = await app.mail.waitFor((m) => m.to.includes(REVIEWER) && /shares the report/.test(m.subject), 10000)
    const link = /(http:\/\/\S+\/reports\/\d+)/.exec(mail.text)![1]!
    expect(link.startsWith(app.baseUrl!)).toBe(true)

    // the reviewer, in a fresh session, follows the link and signs in
    await context.clearCookies()
    await page.goto(link, { waitUntil: 'domcontentloaded' })
    await page.locator('input[name="email"]').waitFor()
    await signInAs(REVIEWER)
    await page.locator('[data-test="report-title"]', { hasText: 'Vela Sorrel: Demo solution' }).waitFor()
    await page.locator('[data-test="review-body"] textarea').first().fill('The residuals look clean; fine by me.')
    await page.locator('[data-test="review-comment"]').click()
    await page.locator('[data-test="review-list"]', { hasText: 'The residuals look clean' }).waitFor()
    await page.locator('[data-test="review-approve"]').click()
    await page.locator('[data-test="approvals-v1"]', { hasText: 'Ines Reviewer: approved' }).waitFor()
    await app.mail.waitFor((m) => m.to.includes(ANALYST) && /Ines Reviewer approved/.test(m.subject), 10000)

    // the analyst sees the approval
    await context.clearCookies()
    await page.goto(link, { waitUntil: 'domcontentloaded' })
    await signInAs(ANALYST)
    await page.locator('[data-test="approvals-v1"]', { hasText: 'Ines Reviewer: approved' }).waitFor()
    mkdirSync(shots, { recursive: true })
    await page.screenshot({ path: join(shots, 'report-approved.png'), fullPage: true })
    expect(pageErrors).toEqual([])
  }), 180000)
})
