// Browser test of joining a team from an e-mailed invitation (issue 11, hole 10): the owner invites
// a new address; the invitee opens the link, creates an account on the invitation page and lands in
// the team's stars, with no "Invitation not found" and no second "Join the team" step.
// Debian's Chromium via playwright-core; the app runs in-process on its own database with the demo.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { TestApp } from '../helpers/app.ts'
import { openBrowser, type BrowserHarness } from '../helpers/browser.ts'
import { signIn } from '../server/client.ts'

const OWNER = 'nadia.owner@lanternfield.test'
const INVITEE = 'new.member@elsewhere.test'

let browser: BrowserHarness
let app: TestApp
let page: Page

beforeAll(async () => {
  browser = await openBrowser({ distDir: process.env.STARSWAY_DIST, timeout: 60_000 })
  ;({ app, page } = browser)
}, 180_000)
afterAll(async () => { await browser?.close() })

describe('joining a team from an invitation', () => {
  it('registering from the e-mailed link joins the team and opens its stars', () => browser.scenario('join', async () => {
    const owner = await signIn(app.app, OWNER)
    await owner.post(`/api/teams/${app.seed!.teamId}/invitations`, { email: INVITEE, role: 'reviewer' }).expect(201)
    const mail = await app.mail.waitFor((m) => m.to.includes(INVITEE) && /invites you/.test(m.subject))
    const link = /(https?:\/\/\S+\/invite\?token=[A-Za-z0-9_-]+)/.exec(mail.text)![1]!
    const token = new URL(link).searchParams.get('token')!
    await page.goto(`${app.baseUrl}/invite?token=${token}`)
    await expect.poll(() => page.getByText('You are invited to join').isVisible(), { timeout: 60_000 }).toBe(true)
    // the invited address is filled in and fixed
    expect(await page.getByLabel('E-mail').inputValue()).toBe(INVITEE)
    await page.getByLabel('Name').fill('New Member')
    await page.getByLabel('Password').fill('a long enough invitee password')
    await page.getByRole('button', { name: 'Create account' }).click()
    await page.waitForURL(/\/stars$/, { timeout: 60_000 })
    await expect.poll(() => page.getByText('Vela Sorrel').first().isVisible(), { timeout: 60_000 }).toBe(true)
    expect(await page.getByText('Invitation not found').count()).toBe(0)
    expect(await page.getByRole('button', { name: 'Join the team' }).count()).toBe(0)
    // the server agrees: a reviewer of the demo team
    const me = await page.evaluate(async () => (await fetch('/api/auth/me')).json()) as { memberships: Array<{ teamId: number; role: string }> }
    expect(me.memberships).toEqual([expect.objectContaining({ teamId: app.seed!.teamId, role: 'reviewer' })])
    expect(browser.pageErrors).toEqual([])
  }), 300_000)
})
