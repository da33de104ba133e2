// Browser test of detection limits and the observation planner against the built client, the real
// API and a job worker on the test database: on the demo star "Vela Sorrel" (fixtures/demo/README.md)
// the demo analyst runs the search, maps the limits on a small grid (the map with its 50 % and 90 %
// contours and the table appear; the table downloads as CSV), runs a short posterior sampling, and
// asks the planner for the next good nights at an invented observatory (the predicted curve and the
// recommended dates appear; CSV and iCalendar downloads). Debian's Chromium via playwright-core;
// screenshots in out/e2e/ (limits-map.png, plan.png).
import { mkdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { TestApp } from '../helpers/app.ts'
import { openBrowser, shots, type BrowserHarness } from '../helpers/browser.ts'
import { startJobWorkers, type JobWorkers } from '../../server/jobs/index.ts'
import { createMailer } from '../../server/mail/mailer.ts'
import type { Services } from '../../server/services.ts'

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
  // the planner needs the star's coordinates (the demo stars have none): invented ones, up at night in the south in December
  await app.models.Star.update({ raDeg: 52.3, decDeg: -31.4 }, { where: { name: 'Vela Sorrel' } })
  workers = await startJobWorkers(services, { concurrency: 2, pollingIntervalSeconds: 0.5, staleSeconds: 10 })
}, 90000)

afterAll(async () => {
  await workers?.stop()
  services?.mailer.close()
  await browser?.close()
})

/** Clicks a button that makes the page download a file; returns the file's text. */
async function downloadText(selector: string): Promise<{ name: string; text: string }> {
  const [download] = await Promise.all([page.waitForEvent('download'), page.locator(selector).click()])
  const path = await download.path()
  return { name: download.suggestedFilename(), text: readFileSync(path!, 'utf8') }
}

describe('detection limits and the planner in the browser', () => {
  it('analyst: search → limits map with contours and table → short sampling → next good nights → exports', { timeout: 600_000 }, () => browser.scenario('limits-plan', async () => {
    mkdirSync(shots, { recursive: true })
    await page.goto(`${app.baseUrl}/stars`, { waitUntil: 'domcontentloaded' })
    await browser.signIn('tomas.analyst@lanternfield.test')
    await page.locator('[data-test="star-table"] tbody a', { hasText: 'Vela Sorrel' }).click()
    await page.locator('[data-test="star-name"]', { hasText: 'Vela Sorrel' }).waitFor()
    await page.locator('[data-test="open-analysis"]').click()
    await page.locator('[data-test="analysis-title"]', { hasText: 'Vela Sorrel' }).waitFor()
    await page.locator('[data-test="run-search"]').click()
    await page.locator('[data-test="search-result"]').waitFor({ timeout: 120000 })

    // ---- detection limits on a small grid
    const limits = page.locator('[data-test="limits-panel"]')
    await limits.scrollIntoViewIfNeeded()
    await page.locator('[data-test="limits-periods"] input').fill('8')
    await page.locator('[data-test="limits-masses"] input').fill('8')
    await page.locator('[data-test="limits-phases"] input').fill('2')
    await page.locator('[data-test="limits-seed"] input').fill('5')
    await page.locator('[data-test="limits-start"]').click()
    const table = page.locator('[data-test="limits-table"]')
    await table.waitFor({ timeout: 240000 })
    await limits.locator('canvas').first().waitFor()
    const rows = await table.locator('tbody tr').count()
    expect(rows).toBeGreaterThan(0)
    expect(await table.innerText()).toMatch(/M sin i, 90 %/)
    // the run behind the map has both contours (what the chart draws as the 50 % and 90 % lines)
    const runs = (await page.request.get(`${app.baseUrl}/api/stars/${await starId()}/limits`)).ok()
    expect(runs).toBe(true)
    const run = await latestLimits()
    expect(run.state).toBe('succeeded')
    expect(run.seed).toBe(5)
    expect(run.result.contour50.some((p: { massEarth: number | null }) => p.massEarth !== null)).toBe(true)
    expect(run.result.contour90.some((p: { massEarth: number | null }) => p.massEarth !== null)).toBe(true)
    await page.waitForTimeout(500)
    await limits.screenshot({ path: join(shots, 'limits-map.png') })
    const csv = await downloadText('[data-test="limits-csv"]')
    expect(csv.text.split('\r\n')[0]).toBe('period_from_d,period_to_d,msini_50pct_earth,msini_90pct_earth,mean_completeness')
    expect(csv.text.trim().split('\r\n')).toHaveLength(rows + 1)

    // ---- a short posterior sampling, then the planner
    const launcher = page.locator('[data-test="sampling-launcher"]')
    await launcher.scrollIntoViewIfNeeded()
    await page.locator('[data-test="walkers"] input').fill('32')
    await page.locator('[data-test="steps"] input').fill('300')
    await page.locator('[data-test="seed"] input').fill('11')
    await page.locator('[data-test="start-sampling"]').click()
    await page.locator('[data-test="sampling-progress"][data-state="succeeded"]').waitFor({ timeout: 240000 })

    const plan = page.locator('[data-test="plan-panel"]')
    await plan.scrollIntoViewIfNeeded()
    await page.locator('[data-test="plan-run"]').locator('input').first().waitFor({ state: 'attached' })
    await page.locator('[data-test="plan-site-name"] input').fill('Pale Ridge (invented)')
    await page.locator('[data-test="plan-lon"] input').fill('-70.4')
    await page.locator('[data-test="plan-lat"] input').fill('-24.6')
    await page.locator('[data-test="plan-compute"]').click()
    const planTable = page.locator('[data-test="plan-table"]')
    await planTable.waitFor({ timeout: 120000 })
    await plan.locator('canvas').first().waitFor()
    const dates = await planTable.locator('tbody tr').count()
    expect(dates).toBeGreaterThan(0)
    expect(await planTable.innerText()).toMatch(/UTC/)
    await page.waitForTimeout(500)
    await plan.screenshot({ path: join(shots, 'plan.png') })
    const planCsv = await downloadText('[data-test="plan-csv"]')
    expect(planCsv.name).toMatch(/next-observations\.csv$/)
    expect(planCsv.text).toContain('Pale Ridge (invented)')
    const ics = await downloadText('[data-test="plan-ics"]')
    expect(ics.name).toMatch(/\.ics$/)
    expect(ics.text).toContain('BEGIN:VCALENDAR')
    expect(ics.text.match(/BEGIN:VEVENT/g)?.length).toBe(dates)
    expect(pageErrors).toEqual([])
  }))
})

async function starId(): Promise<number> {
  return (await app.models.Star.findOne({ where: { name: 'Vela Sorrel' } }))!.id
}

async function latestLimits() {
  const list = await (await page.request.get(`${app.baseUrl}/api/stars/${await starId()}/limits`)).json() as Array<{ id: number }>
  return (await page.request.get(`${app.baseUrl}/api/limits/${list[0]!.id}`)).json()
}
