// Browser test of activity modelled as noise: the demo analyst opens the spotted star "Tarn Meridian"
// (no planet; spots rotating at ~23 d that the bisector span and S-index follow: fixtures/demo/README.md),
// runs the indicator periodograms, sets a GP noise model with the rotation period taken from the
// strongest indicator peak, fits, and sees the noise section and the GP activity curve over the data.
// Debian's Chromium via playwright-core; the app runs in-process on its own database.
import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { TestApp } from '../helpers/app.ts'
import { openBrowser, shots, type BrowserHarness } from '../helpers/browser.ts'

/** fixtures/demo/README.md: rotation period of the simulated spots. */
const ROTATION = 23

let browser: BrowserHarness
let app: TestApp
let page: Page

beforeAll(async () => {
  // STARSWAY_E2E_DIST: a client built elsewhere (default dist/)
  browser = await openBrowser({ distDir: process.env.STARSWAY_E2E_DIST || undefined, timeout: 90000 }) // generous: a busy machine
  ;({ app, page } = browser)
}, 120000)

afterAll(async () => { await browser?.close() })

describe('a spotted star with a GP noise model in the browser', () => {
  it('indicator peak → GP rotation period → fit → noise section and activity curve', () => browser.scenario('activity', async () => {
    mkdirSync(shots, { recursive: true })
    await page.goto(`${app.baseUrl}/stars`, { waitUntil: 'domcontentloaded' })
    await browser.signIn('tomas.analyst@lanternfield.test')
    await page.locator('[data-test="star-table"] tbody a', { hasText: 'Tarn Meridian' }).click()
    await page.locator('[data-test="open-analysis"]').click()
    await page.locator('[data-test="analysis-title"]', { hasText: 'Tarn Meridian' }).waitFor()
    await page.addStyleTag({ content: 'header.v-app-bar { visibility: hidden !important; }' })

    await page.locator('[data-test="run-indicators"]').click()
    await page.locator('[data-test="indicator-periodograms"] canvas').first().waitFor({ timeout: 120000 })

    // GP noise model: choosing it offers (and fills in) the strongest indicator peak as P_rot
    await page.locator('[data-test="noise-kind"]').click()
    await page.locator('.v-overlay .v-list-item', { hasText: 'Planets + GP' }).click()
    await page.locator('[data-test="rotation-suggestion"]').waitFor({ timeout: 30000 })
    await page.locator('[data-test="use-rotation-suggestion"]').click()
    const prot = Number(await page.locator('[data-test="gp-period-value"] input').inputValue())
    expect(Math.abs(prot - ROTATION), `P_rot ${prot}`).toBeLessThan(3)
    expect(await page.locator('[data-test="gp-period"]').innerText()).toMatch(/from the '(bisector_span|fwhm|s_index)' periodogram peak/)
    await page.locator('[data-test="noise-section"]').screenshot({ path: join(shots, 'activity-noise-form.png') })

    await page.locator('[data-test="fit"]').click()
    const fitted = page.locator('[data-test="fit-results"][data-status="fitted"]')
    await fitted.waitFor({ timeout: 180000 })
    const noise = fitted.locator('[data-test="noise-results"][data-kind="gp"]')
    await noise.waitFor()
    const fittedProt = Number(await noise.locator('[data-test="hyper-P_rot"]').getAttribute('data-value'))
    expect(Math.abs(fittedProt - ROTATION)).toBeLessThan(3)
    expect(await noise.innerText()).toMatch(/Priors: rotation period ~ N\(/)
    await noise.screenshot({ path: join(shots, 'activity-noise-results.png') })

    const plots = page.locator('[data-test="model-plots"][data-ready="true"][data-gp="true"]')
    await plots.waitFor({ timeout: 120000 })
    await plots.locator('[data-test="gp-plot-note"]').waitFor()
    await plots.locator('[data-test="time-chart"] canvas').first().waitFor()
    await page.waitForTimeout(500)
    await plots.locator('[data-test="time-chart"]').screenshot({ path: join(shots, 'activity-gp-curve.png') })
  }), 600000)

  it('search → activity candidate with its evidence → one-click overrule recorded in the model history', () => browser.scenario('activity-overrule', async () => {
    await page.locator('[data-test="run-search"]').click()
    const report = page.locator('[data-test="activity-candidates"]')
    await report.waitFor({ timeout: 300000 }) // the search with a GP, on a possibly busy machine
    const labelled = report.locator('tr[data-activity="true"]').first()
    await labelled.waitFor()
    expect(await labelled.innerText()).toMatch(/not a planet/)
    await report.screenshot({ path: join(shots, 'activity-candidates.png') })
    const signal = (await labelled.getAttribute('data-test'))!.replace('activity-candidate-', '')
    await labelled.locator(`[data-test="overrule-${signal}"]`).click()
    await labelled.locator('[data-test="overrule-reason"] input').fill('seen in transit photometry')
    await labelled.locator('[data-test="overrule-confirm"]').click()
    await page.locator(`[data-test="activity-candidate-${signal}"] [data-test="overruled"]`).waitFor({ timeout: 300000 })
    const meta = await page.locator('[data-test="fit-results"] .meta').first().innerText()
    expect(meta).toMatch(/overruled the .*-d activity label .*Reason: seen in transit photometry/)
  }), 900000)
})
