// Browser test of the Survey page against the built client, the real API and job workers on the
// test database: the demo owner uploads three invented stars at once (two files, one per star, and
// one refused file), sees each file's outcome, the searches finish on the triage queue, the team
// table lists the stars with their figures and a link into each star's analysis, and the queue
// panel shows the worker. Debian's Chromium via playwright-core; screenshot out/e2e/survey.png.
import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { TestApp } from '../helpers/app.ts'
import { openBrowser, shots, type BrowserHarness } from '../helpers/browser.ts'
import { startJobWorkers, type JobWorkers } from '../../server/jobs/index.ts'
import { createMailer } from '../../server/mail/mailer.ts'
import type { Services } from '../../server/services.ts'
import { starFile, syntheticSurvey } from '../server/triage-setup.ts'

let browser: BrowserHarness
let app: TestApp
let services: Services
let workers: JobWorkers
let page: Page
let pageErrors: string[]

beforeAll(async () => {
  browser = await openBrowser(process.env.STARSWAY_E2E_DIST ? { distDir: process.env.STARSWAY_E2E_DIST } : {})
  ;({ app, page, pageErrors } = browser)
  services = { config: app.config, sequelize: app.db.sequelize, models: app.models, mailer: createMailer(app.config.smtp) }
  workers = await startJobWorkers(services, { concurrency: 2, pollingIntervalSeconds: 0.5, staleSeconds: 10 })
}, 90000)

afterAll(async () => {
  await workers?.stop()
  services?.mailer.close()
  await browser?.close()
})

describe('the survey page', () => {
  it('owner: uploads a folder of stars, reads the outcomes, the triage table and the queue', { timeout: 300_000 }, () => browser.scenario('survey', async () => {
    mkdirSync(shots, { recursive: true })
    await page.goto(`${app.baseUrl}/stars`, { waitUntil: 'domcontentloaded' })
    await browser.signIn('nadia.owner@lanternfield.test')
    await page.locator('[data-test="nav-survey"]').click()
    await page.locator('[data-test="survey-upload"]').waitFor()
    const stars = syntheticSurvey(3, 60, 'Folder')
    const files = stars.slice(0, 2).map((st) => ({ name: `${st.name}.txt`, mimeType: 'text/plain', buffer: Buffer.from(starFile(st)) }))
    files.push({ name: 'no-mass.txt', mimeType: 'text/plain', buffer: Buffer.from(starFile(stars[2]!).replace('# starMass: 0.9 ± 0.05\n', '')) })
    await page.locator('[data-test="survey-files"] input[type="file"]').setInputFiles(files)
    await page.locator('[data-test="survey-send"]').click()
    const result = page.locator('[data-test="survey-result"]')
    await result.waitFor({ timeout: 60000 })
    const outcome = await result.innerText()
    expect(outcome).toContain('60 measurements stored')
    expect(outcome).toMatch(/Refused: no-mass\.txt: the star "Folder 003" is new and its mass is unknown/)

    const table = page.locator('[data-test="triage-table"]')
    for (const st of stars.slice(0, 2)) await table.locator('tr', { hasText: st.name }).locator('text=done').waitFor({ timeout: 180000 })
    const link = table.locator('a', { hasText: stars[0]!.name })
    expect(await link.getAttribute('href')).toMatch(/^\/stars\/\d+\/analysis$/)
    const queue = page.locator('[data-test="survey-queue"]')
    await page.reload({ waitUntil: 'domcontentloaded' }) // the queue panel's figures after the run
    await queue.waitFor()
    expect(await queue.innerText()).toMatch(/Workers seen in the last 10 minutes \(1\)/)
    await page.waitForTimeout(300)
    await page.screenshot({ path: join(shots, 'survey.png'), fullPage: true })
    expect(pageErrors).toEqual([])
  }))
})
