// Browser test of the review of a report against the built client (dist/) and the real API: the
// demo analyst freezes the demo solution of "Vela Sorrel" (two planets fitted from start values near
// fixtures/demo/README.md's P = 12.4 d and 187 d) and shares it with the demo reviewer; the reviewer
// opens the e-mailed link, signs in, comments and approves; the analyst sees the approval.
// Debian's Chromium via playwright-core; the app runs in-process on its own database.
import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import type { TestApp } from '../helpers/app.ts'
import { openBrowser, shots, type BrowserHarness } from '../helpers/browser.ts'
import { signIn } from '../server/client.ts'

const ANALYST = 'tomas.analyst@lanternfield.test'
const REVIEWER = 'ines.reviewer@lanternfield.test'
const SPEC = { planets: [{ period: 12.4, K: 9, e: 0.1, omegaDeg: 40 }, { period: 187, K: 14, e: 0.25, omegaDeg: 210 }], trend: 'none' }

let browser: BrowserHarness
let app: TestApp
let context: BrowserContext
let page: Page
let pageErrors: string[]

beforeAll(async () => {
  browser = await openBrowser({ distDir: process.env.STARSWAY_DIST })
  ;({ app, context, page, pageErrors } = browser)
  // the demo solution: the two-planet model fitted through the API
  const analyst = await signIn(app.app, ANALYST)
  const starId = app.seed!.starIds!['Vela Sorrel']!
  const model = (await analyst.post(`/api/stars/${starId}/models`, { name: 'Demo solution', spec: SPEC }).expect(201)).body.id
  await analyst.post(`/api/models/${model}/fit`, {}).expect(200)
}, 120000)

afterAll(async () => { await browser?.close() })

const scenario = (name: string, body: () => Promise<void>) => browser.scenario(name, body)
const signInAs = (email: string) => browser.signIn(email)

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
