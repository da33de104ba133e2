// Browser test of posterior sampling against the built client (dist/), the real API and a job
// worker on the test database: the demo analyst finds the signals of the simulated two-planet star
// "Vela Sorrel" (fixtures/demo/README.md), starts a short run, watches it finish and reads the
// credible intervals and the corner plot; the demo reviewer sees the run but no start or cancel.
// Debian's Chromium via playwright-core.
import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import type { TestApp } from '../helpers/app.ts'
import { openBrowser, shots, type BrowserHarness } from '../helpers/browser.ts'
import { startJobWorkers, type JobWorkers } from '../../server/jobs/index.ts'
import { createMailer } from '../../server/mail/mailer.ts'
import type { Services } from '../../server/services.ts'

let browser: BrowserHarness
let app: TestApp
let services: Services
let workers: JobWorkers
let context: BrowserContext
let page: Page
let pageErrors: string[]

beforeAll(async () => {
  browser = await openBrowser()
  ;({ app, context, page, pageErrors } = browser)
  services = { config: app.config, sequelize: app.db.sequelize, models: app.models, mailer: createMailer(app.config.smtp) }
  workers = await startJobWorkers(services, { concurrency: 1, pollingIntervalSeconds: 0.5, staleSeconds: 10 })
}, 90000)

afterAll(async () => {
  await workers?.stop()
  services?.mailer.close()
  await browser?.close()
})

const scenario = (name: string, body: () => Promise<void>) => browser.scenario(name, body)

async function signInAndOpen(email: string) {
  await page.goto(`${app.baseUrl}/stars`, { waitUntil: 'domcontentloaded' })
  await browser.signIn(email)
  await page.locator('[data-test="star-table"] tbody a', { hasText: 'Vela Sorrel' }).click()
  await page.locator('[data-test="star-name"]', { hasText: 'Vela Sorrel' }).waitFor()
  await page.locator('[data-test="open-analysis"]').click()
  await page.locator('[data-test="analysis-title"]', { hasText: 'Vela Sorrel' }).waitFor()
}

describe('posterior sampling in the browser', () => {
  it('analyst: search → short run → progress to done → interval table and corner plot', { timeout: 240_000 }, () => scenario('sampling', async () => {
    mkdirSync(shots, { recursive: true })
    await signInAndOpen('tomas.analyst@lanternfield.test')
    await page.locator('[data-test="run-search"]').click()
    await page.locator('[data-test="search-result"]').waitFor({ timeout: 90000 })

    const launcher = page.locator('[data-test="sampling-launcher"]')
    await launcher.waitFor()
    await launcher.scrollIntoViewIfNeeded()
    await page.locator('[data-test="walkers"] input').fill('32')
    await page.locator('[data-test="steps"] input').fill('300')
    await page.locator('[data-test="seed"] input').fill('11')
    await page.locator('[data-test="start-sampling"]').click()

    const progress = page.locator('[data-test="sampling-progress"]')
    await progress.waitFor()
    expect(['queued', 'running', 'succeeded']).toContain(await progress.getAttribute('data-state'))
    await page.locator('[data-test="sampling-progress"][data-state="succeeded"]').waitFor({ timeout: 120000 })
    expect(await progress.getAttribute('data-steps')).toBe('300')

    const table = page.locator('[data-test="interval-table"]')
    await table.waitFor()
    const text = await table.innerText()
    for (const name of ['K b', 'e b', 'M sin i b', 'K c', 'M sin i c', 'a b']) expect(text).toContain(name)
    expect(await page.locator('[data-test="interval-K b"]').innerText()).toMatch(/\+\d[\d.]* −\d[\d.]* m\/s/)
    expect(await page.locator('[data-test="interval-M sin i b"]').innerText()).toContain('M_Jup')
    // 300 steps is short: the run says it has not settled.
    await page.locator('[data-test="convergence-warnings"], [data-test="convergence-ok"]').first().waitFor()

    const corner = page.locator('[data-test="corner-plot"]')
    await corner.locator('canvas').first().waitFor()
    const band = page.locator('[data-test="posterior-band"][data-ready="true"]')
    await band.locator('canvas').first().waitFor()
    expect(Number(await band.getAttribute('data-draws'))).toBeGreaterThan(100)
    expect(Number(await band.getAttribute('data-band-width'))).toBeGreaterThan(0)
    await page.waitForTimeout(500)
    await page.locator('[data-test="sampling-panel"]').screenshot({ path: join(shots, 'sampling-results.png') })
    await corner.scrollIntoViewIfNeeded()
    await corner.screenshot({ path: join(shots, 'sampling-corner.png') })
    await band.scrollIntoViewIfNeeded()
    await page.locator('[data-test="posterior-band"]').screenshot({ path: join(shots, 'sampling-band.png') })
    // Zoomed in (mouse wheel over the chart) the band is wide enough to see.
    const box = (await band.locator('canvas').first().boundingBox())!
    await page.mouse.move(box.x + box.width * 0.55, box.y + box.height * 0.5)
    for (let i = 0; i < 12; i++) { await page.mouse.wheel(0, -400); await page.waitForTimeout(60) }
    await page.waitForTimeout(300)
    await page.locator('[data-test="posterior-band"]').screenshot({ path: join(shots, 'sampling-band-zoom.png') })
    await page.locator('[data-test="trace-plots"]').scrollIntoViewIfNeeded()
    await page.locator('[data-test="trace-plots"]').screenshot({ path: join(shots, 'sampling-traces.png') })
    expect(pageErrors).toEqual([])
  }))

  it('reviewer: reads the run, sees no start or cancel', { timeout: 60_000 }, () => scenario('sampling-reviewer', async () => {
    await page.locator('[data-test="user-menu"]').click().catch(() => {})
    await context.clearCookies()
    await signInAndOpen('ines.reviewer@lanternfield.test')
    await page.locator('[data-test="sampling-progress"][data-state="succeeded"]').waitFor()
    await page.locator('[data-test="interval-table"]').waitFor()
    expect(await page.locator('[data-test="start-sampling"]').count()).toBe(0)
    expect(await page.locator('[data-test="cancel-sampling"]').count()).toBe(0)
  }))
})
