// Browser test of the core workflow against the built client (dist/) and the real API: sign in as
// the demo analyst, create a star, add a published table through the wizard, see every point in the
// chart and the table, exclude one point and see the chart count it. Debian's Chromium via
// playwright-core; the app runs in-process on its own database and mail server.
import { mkdirSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { TestApp } from '../helpers/app.ts'
import { openBrowser, shots, type BrowserHarness } from '../helpers/browser.ts'

const root = resolve(import.meta.dirname, '../..')
/** HD 20868, HARPS, 48 rows in km/s (fixtures/published/README.md gives the source). */
const table = join(root, 'fixtures/published/hd20868-harps.txt')

let browser: BrowserHarness
let app: TestApp
let page: Page
let pageErrors: string[]

beforeAll(async () => {
  browser = await openBrowser({ timeout: 20000 })
  ;({ app, page, pageErrors } = browser)
})

afterAll(async () => { await browser?.close() })

const scenario = (name: string, body: () => Promise<void>) => browser.scenario(name, body)

describe('adding a velocity table in the browser', () => {
  it('signs in, uploads 48 km/s rows through the wizard, shows them all, and counts an excluded point', () => scenario('upload', async () => {
    await page.goto(`${app.baseUrl}/stars`, { waitUntil: 'domcontentloaded' })
    await page.locator('input[name="email"]').waitFor()
    expect(new URL(page.url()).pathname).toBe('/sign-in')
    await browser.signIn('tomas.analyst@lanternfield.test')
    await page.locator('[data-test="star-table"] tbody a').first().waitFor()
    mkdirSync(shots, { recursive: true })

    // A seeded star with several instruments, for the eye (screenshot).
    await page.locator('[data-test="star-table"] tbody a').first().click()
    await page.locator('[data-test="velocity-chart"] canvas').first().waitFor()
    expect(Number(await page.locator('[data-test="velocity-chart"]').getAttribute('data-points'))).toBeGreaterThan(0)
    await page.locator('[data-test="velocity-chart"]').screenshot({ path: join(shots, 'demo-star-chart.png') })
    await page.locator('header a[href="/stars"]').first().click()
    await page.locator('[data-test="new-star"]').waitFor()

    // A new star for the published table.
    await page.locator('[data-test="new-star"]').click()
    await page.locator('input[name="name"]').fill('HD 20868')
    await page.locator('input[name="massMsun"]').fill('0.78')
    await page.locator('input[name="massErrMsun"]').fill('0.03')
    await page.locator('[data-test="star-form-submit"]').click()
    await page.locator('[data-test="star-name"]', { hasText: 'HD 20868' }).waitFor()

    // The wizard: pick → detected columns → rows → save.
    await page.locator('[data-test="add-data"]').click()
    await page.locator('[data-test="file-input"] input[type="file"]').setInputFiles(table)
    await page.locator('[data-test="detect"]').click()
    const mapping = page.locator('[data-test="mapping-hd20868-harps.txt"]')
    await mapping.waitFor()
    await expect.poll(() => page.locator('[data-test="unit-select"]').innerText()).toContain('km/s')
    await page.locator('[data-test="instrument-name"] input').fill('HARPS')
    await page.screenshot({ path: join(shots, 'add-data-columns.png'), fullPage: true })
    await page.locator('[data-test="to-rows"]').click()
    const preview = page.locator('[data-test="preview-hd20868-harps.txt"]')
    await preview.waitFor()
    expect(await preview.innerText()).toContain('48 data rows')
    expect(await preview.innerText()).toContain('HARPS: 48')
    expect(await preview.locator('tr[data-problem]').count()).toBe(0)
    await page.locator('[data-test="to-save"]').click()
    await page.locator('[data-test="commit"]').click()

    // Back on the star page: every point in the chart and the table.
    const chart = page.locator('[data-test="velocity-chart"][data-points="48"]')
    await chart.waitFor()
    expect(await chart.getAttribute('data-instruments')).toBe('HARPS')
    expect(await chart.getAttribute('data-excluded')).toBe('0')
    await page.locator('[data-test="velocity-chart"] canvas').first().waitFor()
    const tableBox = page.locator('[data-test="measurement-table"]')
    expect(await tableBox.getAttribute('data-total')).toBe('48')
    await expect.poll(() => page.locator('[data-test="measurement-count"]').innerText()).toBe('48 of 48 measurements')

    // Exclude one point with a reason: the chart draws it apart and counts it.
    await page.locator('[data-test="exclude"]').first().click()
    await page.locator('[data-test="exclude-dialog"] textarea').first().fill('Test: low signal-to-noise night')
    await page.locator('[data-test="exclude-confirm"]').click()
    await page.locator('[data-test="velocity-chart"][data-excluded="1"][data-included="47"]').waitFor()
    await page.locator('[data-test="exclude-dialog"]').waitFor({ state: 'detached' })
    expect(await tableBox.innerText()).toContain('Test: low signal-to-noise night')

    await page.locator('[data-test="velocity-chart"]').scrollIntoViewIfNeeded()
    await page.screenshot({ path: join(shots, 'star-page.png'), fullPage: true })
    await page.locator('[data-test="velocity-chart"]').screenshot({ path: join(shots, 'velocity-chart.png') })

    // Hiding excluded points takes them off the chart, not out of the table.
    await page.locator('[data-test="toggle-excluded"] input').click()
    await page.locator('[data-test="velocity-chart"][data-points="47"][data-excluded="0"]').waitFor()
    expect(await tableBox.getAttribute('data-total')).toBe('48')
    expect(pageErrors).toEqual([])
  }), 180000)
})
