// The share e-mail to an outsider tells the truth about the invitation: after an analyst's share
// the owner's approval is pending (no invitation yet); after an owner's share the invitation is sent.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { analysisModels } from '../../server/db/models-analysis.ts'
import { reportModels } from '../../server/db/models-reports.ts'
import { signIn } from './client.ts'
import { EMAIL } from './roles.ts'

let t: TestApp
let n = 0
beforeAll(async () => { t = await startTestApp({ seed: true }) }, 180_000)
afterAll(async () => { await t?.close() })

async function report(): Promise<number> {
  const starId = Object.values(t.seed!.starIds!)[0]!
  const fm = await analysisModels(t.db.sequelize, t.models).FitModel.create({ starId, name: `Mail ${++n}`, currentVersion: 1, createdBy: null, archivedAt: null })
  return (await reportModels(t.db.sequelize, t.models).Report.create({ starId, modelId: fm.id, title: `Mailed report ${n}`, currentVersion: 1, createdBy: null })).id
}

describe('share e-mail to someone outside the team', () => {
  it("after an analyst's share: says an owner must approve first, promises no invitation now", async () => {
    const analyst = await signIn(t.app, EMAIL.analyst)
    const to = 'waiting@elsewhere.test'
    await analyst.post(`/api/reports/${await report()}/shares`, { email: to }).expect(201)
    const mail = await t.mail.waitFor((m) => m.to.includes(to) && /shares the report/.test(m.subject))
    expect(mail.text).toMatch(/An owner of the team has been asked to approve that; when they do, you will get an invitation/)
    expect(mail.text).not.toMatch(/You are invited to the team/)
  })

  it("after an owner's share: says the invitation comes in a separate e-mail (and it does)", async () => {
    const owner = await signIn(t.app, EMAIL.owner)
    const to = 'invited@elsewhere.test'
    await owner.post(`/api/reports/${await report()}/shares`, { email: to }).expect(201)
    const mail = await t.mail.waitFor((m) => m.to.includes(to) && /shares the report/.test(m.subject))
    expect(mail.text).toMatch(/You are invited to the team .* in a separate e-mail/)
    await t.mail.waitFor((m) => m.to.includes(to) && /invites you/.test(m.subject))
  })
})
