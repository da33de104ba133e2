// Browser test of the analysis workflow against the built client (dist/) and the real API: sign in
// as the demo analyst, open the simulated two-planet star "Vela Sorrel" (fixtures/demo/README.md:
// P = 12.4 d and 187 d), run the periodogram, add its top peak as a planet, fit, find the other
// planet in the residual periodogram, add it, fit again, and see the comparison prefer two planets.
// Debian's Chromium via playwright-core; the app runs in-process on its own database.
import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { TestApp } from '../helpers/app.ts'
import { openBrowser, shots, type BrowserHarness } from '../helpers/browser.ts'

/** The demo star's planets (fixtures/demo/README.md, invented and simulated). */
const PERIODS = [12.4, 187]

let browser: BrowserHarness
let app: TestApp
let page: Page
let pageErrors: string[]

beforeAll(async () => {
  browser = await openBrowser()
  ;({ app, page, pageErrors } = browser)
}, 60000)

afterAll(async () => { await browser?.close() })

const scenario = (name: string, body: () => Promise<void>) => browser.scenario(name, body)

/** True when `period` lies within 3 % of one of the demo planets' periods. */
function nearPlanet(period: number): number | undefined {
  return PERIODS.find((p) => Math.abs(period - p) / p < 0.03)
}

describe('from velocities to a two-planet solution in the browser', () => {
  it('periodogram → top peak → fit → residual peak → second planet → fit → comparison prefers two planets', () => scenario('analysis', async () => {
    mkdirSync(shots, { recursive: true })
    await page.goto(`${app.baseUrl}/stars`, { waitUntil: 'domcontentloaded' })
    await browser.signIn('tomas.analyst@lanternfield.test')
    await page.locator('[data-test="star-table"] tbody a', { hasText: 'Vela Sorrel' }).click()
    await page.locator('[data-test="star-name"]', { hasText: 'Vela Sorrel' }).waitFor()
    await page.locator('[data-test="open-analysis"]').click()
    await page.locator('[data-test="analysis-title"]', { hasText: 'Vela Sorrel' }).waitFor()
    // The fixed app bar would cover parts of the element screenshots below.
    await page.addStyleTag({ content: 'header.v-app-bar { visibility: hidden !important; }' })

    // The periodogram of the velocities: its top peak is one of the two planets.
    await page.locator('[data-test="run-periodogram"]').click()
    const rv = page.locator('[data-test="rv-periodogram"][data-ready="true"]')
    await rv.waitFor({ timeout: 90000 }) // GLS and Keplerian periodograms, on a possibly busy machine
    await rv.locator('canvas').first().waitFor()
    const firstPeriod = Number(await rv.getAttribute('data-top-period'))
    const first = nearPlanet(firstPeriod)
    expect(first, `top peak at ${firstPeriod} d`).toBeDefined()
    expect(Number(await rv.getAttribute('data-top-fap'))).toBeLessThan(0.001)
    expect(await rv.innerText()).toContain('FAP')
    await page.locator('[data-test="peak-caution"]').waitFor()
    await page.locator('[data-test="run-indicators"]').click()
    await page.locator('[data-test="indicator-periodograms"] canvas').first().waitFor({ timeout: 90000 })
    await page.locator('[data-test="rv-periodogram-window"] input').click()
    await page.waitForTimeout(300)
    await rv.screenshot({ path: join(shots, 'analysis-periodogram.png') })
    await page.locator('[data-test="indicator-periodograms"]').screenshot({ path: join(shots, 'analysis-indicators.png') })

    // Click the top peak: a planet at that period with a start K, e = 0; fit it.
    await rv.locator('[data-test="add-peak-0"]').click()
    await page.locator('[data-test="planet-0"]').waitFor()
    expect(Number(await page.locator('[data-test="value-0-period"] input').inputValue())).toBeCloseTo(firstPeriod, 3)
    expect(Number(await page.locator('[data-test="value-0-K"] input').inputValue())).toBeGreaterThan(0)
    expect(await page.locator('[data-test="value-0-e"] input').inputValue()).toBe('0')
    await page.locator('[data-test="fit"]').click()
    const oneFit = page.locator('[data-test="fit-results"][data-status="fitted"][data-planets="1"]')
    await oneFit.waitFor({ timeout: 90000 })
    expect(nearPlanet(Number(await oneFit.locator('[data-test="planet-result-b"]').getAttribute('data-period')))).toBe(first)

    // The residual periodogram shows the other planet.
    const residual = page.locator('[data-test="residual-periodogram"][data-ready="true"]')
    await residual.waitFor({ timeout: 90000 })
    const secondPeriod = Number(await residual.getAttribute('data-top-period'))
    const second = nearPlanet(secondPeriod)
    expect(second, `residual top peak at ${secondPeriod} d`).toBeDefined()
    expect(second).not.toBe(first)
    expect(Number(await residual.getAttribute('data-top-fap'))).toBeLessThan(0.001)
    await residual.scrollIntoViewIfNeeded()
    await residual.screenshot({ path: join(shots, 'analysis-residual-periodogram.png') })

    // Add it (a new model; the one-planet model stays for the comparison) and fit.
    await residual.locator('[data-test="add-peak-0"]').click()
    await page.locator('[data-test="planet-1"]').waitFor()
    expect(await page.locator('[data-test="model-state"]').innerText()).toContain('New model')
    await page.locator('[data-test="fit"]').click()
    const twoFit = page.locator('[data-test="fit-results"][data-status="fitted"][data-planets="2"]')
    await twoFit.waitFor({ timeout: 90000 })
    const fitted = await Promise.all(['b', 'c'].map(async (l) => nearPlanet(Number(await twoFit.locator(`[data-test="planet-result-${l}"]`).getAttribute('data-period')))))
    expect(fitted.sort((a, b) => a! - b!)).toEqual(PERIODS)

    // The comparison prefers the two-planet model.
    const preferredRow = page.locator('[data-test="compare-table"] tr[data-preferred="true"]')
    await page.locator('[data-test="compare-table"] tbody tr[data-planets="2"]').waitFor()
    await page.locator('[data-test="compare-table"] tbody tr[data-planets="1"]').waitFor()
    expect(await preferredRow.getAttribute('data-planets')).toBe('2')
    expect(await page.locator('[data-test="compare-reading"]').innerText()).not.toBe('')

    // The plots and the derived quantities, for the eye.
    const plots = page.locator('[data-test="model-plots"][data-ready="true"]')
    await plots.waitFor()
    await plots.locator('[data-test="folded-c"]').waitFor()
    await page.waitForTimeout(300)
    await twoFit.screenshot({ path: join(shots, 'analysis-fit-results.png') })
    await plots.screenshot({ path: join(shots, 'analysis-model-plots.png') })
    await page.locator('[data-test="derived-panel"]').screenshot({ path: join(shots, 'analysis-derived.png') })
    await page.locator('[data-test="compare-table"]').screenshot({ path: join(shots, 'analysis-compare.png') })
    await page.locator('[data-test="model-editor"]').screenshot({ path: join(shots, 'analysis-model-form.png') })

    // Saved work comes back: a fresh visit shows the preferred model, its plots and its residual periodogram.
    // (generous limits: the page loads every saved run at once and the test machine may be busy)
    await page.reload()
    await page.locator('[data-test="fit-results"][data-status="fitted"][data-planets="2"]').waitFor({ timeout: 90000 })
    await page.locator('[data-test="residual-periodogram"][data-ready="true"]').waitFor({ timeout: 90000 })
    await page.locator('[data-test="rv-periodogram"][data-ready="true"]').waitFor({ timeout: 90000 })
    // the Keplerian periodogram is drawn beside the sinusoid's, with its peaks listed
    await page.locator('[data-test="rv-periodogram"] [data-test="keplerian-peak-0"]').waitFor()
    expect(pageErrors).toEqual([])
  }), 600000) // the whole workflow; generous for a busy shared machine
})
