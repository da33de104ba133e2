// Reports: freezing (immutability, versions with a diff), exports (PDF parsed back, LaTeX, CSV,
// JSON reproducing the model), sharing rules and e-mails through the local SMTP server.
import { execFileSync } from 'node:child_process'
import { existsSync, mkdirSync, mkdtempSync, writeFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, anonymous, type Client } from './client.ts'
import { expectClose } from '../helpers/expect-close.ts'
import { modelVelocity } from '../../shared/report/curve.ts'
import type { ReportDetail, ReportVersion, ReportSnapshot } from '../../shared/api/reports.ts'

const root = resolve(import.meta.dirname, '../..')
const EMAIL = {
  owner: 'nadia.owner@lanternfield.test', analyst: 'tomas.analyst@lanternfield.test',
  reviewer: 'ines.reviewer@lanternfield.test', outsider: 'piet@quillmere.test',
}
// Start values near the invented demo planets of Vela Sorrel (fixtures/demo/README.md)
const SPEC = {
  planets: [{ period: 12.4, K: 9, e: 0.1, omegaDeg: 40 }, { period: 187, K: 14, e: 0.25, omegaDeg: 210 }],
  trend: 'none',
}

let t: TestApp
let analyst: Client, reviewer: Client, owner: Client, outsider: Client
let starId: number, modelId: number, reportId: number
let v1: ReportVersion

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  starId = t.seed!.starIds!['Vela Sorrel']!
  analyst = await signIn(t.app, EMAIL.analyst)
  reviewer = await signIn(t.app, EMAIL.reviewer)
  owner = await signIn(t.app, EMAIL.owner)
  outsider = await signIn(t.app, EMAIL.outsider)
  await analyst.post(`/api/stars/${starId}/periodograms`, { kind: 'rv', oversample: 3 }).expect(201)
  modelId = (await analyst.post(`/api/stars/${starId}/models`, { name: 'Two planets', spec: SPEC }).expect(201)).body.id
  const fit = await analyst.post(`/api/models/${modelId}/fit`, {})
  expect(fit.status, JSON.stringify(fit.body).slice(0, 500)).toBe(200)
  expect(fit.body.current.status).toBe('fitted')
}, 120_000)
afterAll(async () => { await t?.close() })

describe('freezing', () => {
  it('needs a fitted version', async () => {
    const draft = (await analyst.post(`/api/stars/${starId}/models`, { name: 'draft', spec: SPEC }).expect(201)).body.id
    const res = await analyst.post(`/api/models/${draft}/report`, {}).expect(400)
    expect(res.body.error.field).toBe('modelId')
  })

  it('freezes version 1 with the data hash, model, result, product version, who and when', async () => {
    const res = await analyst.post(`/api/models/${modelId}/report`, {})
    expect(res.status, JSON.stringify(res.body).slice(0, 500)).toBe(201)
    const d = res.body as ReportDetail
    reportId = d.id
    expect(d.currentVersion).toBe(1)
    expect(d.versions).toHaveLength(1)
    expect(d.versions[0]!.changes).toEqual([])
    v1 = (await reviewer.get(`/api/reports/${reportId}/versions/1`).expect(200)).body
    const s = v1.snapshot
    expect(s.data.hash).toMatch(/^[0-9a-f]{64}$/)
    expect(s.data.nIncluded).toBe(220)
    expect(s.model.version).toBe(2)
    expect(s.result.planets).toHaveLength(2)
    expect(s.product.name).toBe('Starsway')
    expect(s.product.version).toMatch(/^\d+\.\d+\.\d+/)
    expect(s.frozenBy.name).toBe('Tomas Analyst')
    expect(s.periodogram?.fapLevels).toHaveLength(3)
    expect(s.methods.text).toMatch(/Lomb–Scargle/)
    expect(s.methods.references.map((r) => r.key)).toEqual(expect.arrayContaining(['ZK09', 'Baluev08', 'Ford06', 'IAU15']))
    expect(s.methods.references.map((r) => r.key)).not.toContain('GW10') // not sampled
  })

  it('freezing again with nothing changed keeps version 1', async () => {
    const res = await analyst.post(`/api/models/${modelId}/report`, {}).expect(200)
    expect(res.body.created).toBe(false)
    expect(res.body.currentVersion).toBe(1)
  })

  it('a later exclusion does not alter version 1; freezing again makes version 2 with a diff', async () => {
    const m = v1.snapshot.data.points[5]!
    await analyst.patch(`/api/measurements/${m.id}`, { excluded: true, reason: 'cosmic ray on the order' }).expect(200)
    const again = (await reviewer.get(`/api/reports/${reportId}/versions/1`).expect(200)).body as ReportVersion
    expect(again.snapshot).toEqual(v1.snapshot)
    const res = await analyst.post(`/api/models/${modelId}/report`, {}).expect(201)
    expect(res.body.currentVersion).toBe(2)
    const v2 = (await reviewer.get(`/api/reports/${reportId}/versions/2`).expect(200)).body as ReportVersion
    expect(v2.snapshot.data.hash).not.toBe(v1.snapshot.data.hash)
    expect(v2.snapshot.data.changedSinceFit).toBe(true)
    expect(v2.snapshot.data.exclusions.map((x) => [x.id, x.reason])).toEqual([[m.id, 'cosmic ray on the order']])
    const fields = v2.changes.map((c) => c.field)
    expect(fields).toContain('data.hash')
    expect(fields).toContain('data.exclusions')
    expect(v2.changes.find((c) => c.field === 'data.exclusions')!.to).toMatch(String(m.id))
    // the database itself refuses to rewrite a frozen version
    await expect(t.db.sequelize.query(`UPDATE report_versions SET changes = '[]' WHERE report_id = ${reportId}`)).rejects.toThrow(/frozen/)
  })

  it('a refit after the exclusion makes version 3 naming the model version and the changed values', async () => {
    await analyst.post(`/api/models/${modelId}/fit`, {}).expect(200)
    const res = await analyst.post(`/api/models/${modelId}/report`, {}).expect(201)
    expect(res.body.currentVersion).toBe(3)
    const v3 = (await reviewer.get(`/api/reports/${reportId}/versions/3`).expect(200)).body as ReportVersion
    expect(v3.snapshot.data.changedSinceFit).toBe(false)
    expect(v3.snapshot.data.nIncluded).toBe(219)
    const fields = v3.changes.map((c) => c.field)
    expect(fields).toContain('model.version')
    expect(fields).toContain('data.nIncluded')
    expect(fields.some((f) => /^b\.K$|^c\.K$/.test(f))).toBe(true)
    // audit
    const audit = (await reviewer.get(`/api/teams/${t.seed!.teamId}/audit`).expect(200)).body as Array<{ action: string; entityId: number }>
    expect(audit.filter((a) => a.action === 'report.freeze' && a.entityId === reportId)).toHaveLength(3)
  })

  it('lists the star\'s reports for any member and hides them from another team', async () => {
    const list = (await reviewer.get(`/api/stars/${starId}/reports`).expect(200)).body
    expect(list.map((r: { id: number }) => r.id)).toContain(reportId)
    await outsider.get(`/api/reports/${reportId}`).expect(404)
    await outsider.get(`/api/reports/${reportId}/versions/1/pdf`).expect(404)
    await anonymous(t.app).get(`/api/reports/${reportId}`).expect(401)
    await reviewer.post(`/api/models/${modelId}/report`, {}).expect(403)
    await reviewer.get(`/api/reports/${reportId}/versions/9`).expect(404)
  })
})

describe('exports', () => {
  it('JSON holds enough to rebuild the model curve at every included point', async () => {
    const res = await reviewer.get(`/api/reports/${reportId}/versions/1/json`).expect(200)
    const s = res.body as ReportSnapshot & { modelEquation: { text: string } }
    expect(s.modelEquation.text).toMatch(/Σ/)
    const used = s.data.points.filter((p) => p.included)
    const v = modelVelocity(s.result, used.map((p) => p.time), used.map((p) => p.instrument))
    // against the fit's own stored model velocities (server/analyses fit result)
    used.forEach((p, i) => expectClose(v[i]!, p.model!, { atol: 1e-6 }, `model at measurement ${p.id}`))
  })

  it('CSV has one row per point with model, residual, instrument and the excluded flag', async () => {
    const res = await reviewer.get(`/api/reports/${reportId}/versions/2/csv`).expect(200)
    expect(res.headers['content-type']).toMatch(/text\/csv/)
    const lines = res.text.trim().split('\n')
    // one header row (no comment line), units and the time system in the names
    expect(lines[0]).toMatch(/^measurement_id,instrument,(bjd_tdb|jd_utc|jd_tt|hjd|jd)_d,rv_m_s,error_m_s,model_m_s,residual_m_s,excluded,exclusion_reason$/)
    expect(lines).toHaveLength(1 + 220)
    const excluded = lines.filter((l) => l.endsWith(',True,cosmic ray on the order'))
    expect(excluded).toHaveLength(0) // version 2's fit still used that point: it is flagged excluded only from version 3 on
    const v3 = (await reviewer.get(`/api/reports/${reportId}/versions/3/csv`).expect(200)).text.trim().split('\n')
    const row = v3.find((l) => l.endsWith(',True,cosmic ray on the order'))!
    const cells = row.split(',')
    expectClose(Number(cells[3]) - Number(cells[5]), Number(cells[6]), { atol: 1e-9 }, 'residual = rv − model for an excluded point')
  })

  it('ECSV carries the same rows with units in its header', async () => {
    const res = await reviewer.get(`/api/reports/${reportId}/versions/2/ecsv`).expect(200)
    const text = res.text
    expect(text.startsWith('# %ECSV 1.0\n# ---\n')).toBe(true)
    expect(text).toMatch(/name: rv_m_s\n#\s+unit: m \/ s/)
    expect(text.split('\n').filter((l) => l && !l.startsWith('#'))).toHaveLength(1 + 220)
  })

  it('JSON names every unit in astropy spelling', async () => {
    const res = await reviewer.get(`/api/reports/${reportId}/versions/1/json`).expect(200)
    expect(res.body.units['result.planets[].msiniMjup']).toBe('jupiterMass')
    expect(JSON.stringify(res.body)).not.toMatch(/"M_Jup"|"M_Earth"/)
  })

  it('LaTeX is a table float with values rounded by their uncertainty', async () => {
    const res = await reviewer.get(`/api/reports/${reportId}/versions/3/latex`).expect(200)
    expect(res.headers['content-type']).toMatch(/text\/plain/)
    const tex = res.text
    expect(tex).toMatch(/\\begin\{table\*?\}[\s\S]*\\caption\{[\s\S]*\\begin\{tabular\}/)
    expect(tex).not.toMatch(/siunitx|\\SI\{|\\num\{/)
    expect(tex).toMatch(/Period \$P\$ & d &/)
    expect(tex).toMatch(/\$\\pm\$|\\pm /)
    const v3 = (await reviewer.get(`/api/reports/${reportId}/versions/3`).expect(200)).body as ReportVersion
    const b = v3.snapshot.result.planets[0]!
    const { roundByUncertainty } = await import('../../shared/report/round.ts')
    const r = roundByUncertainty(b.K, b.uncertainty.K!)
    expect(tex).toContain(`$${r.value} \\pm ${r.error}$`)
    const pdflatex = ['/usr/bin/pdflatex', '/usr/local/bin/pdflatex'].find((p) => existsSync(p))
    if (!pdflatex) {
      console.log('pdflatex is not installed here: the LaTeX table was checked as text only, not compiled.')
      return
    }
    const dir = mkdtempSync(join(tmpdir(), 'starsway-tex-'))
    try {
      writeFileSync(join(dir, 'paper.tex'), `\\documentclass{article}\n\\begin{document}\n${tex}\n\\end{document}\n`)
      execFileSync(pdflatex, ['-interaction=nonstopmode', '-halt-on-error', 'paper.tex'], { cwd: dir, stdio: 'pipe', timeout: 60_000 })
      expect(existsSync(join(dir, 'paper.pdf'))).toBe(true)
    } finally { rmSync(dir, { recursive: true, force: true }) }
  })

  it('PDF opens and has the summary, plots, periodogram and methods pages', async () => {
    const res = await reviewer.get(`/api/reports/${reportId}/versions/1/pdf`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = []
      r.on('data', (c: Buffer) => chunks.push(c)); r.on('end', () => cb(null, Buffer.concat(chunks)))
    }).expect(200)
    expect(res.headers['content-type']).toBe('application/pdf')
    const pdf = res.body as Buffer
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-')
    mkdirSync(join(root, 'out/reports'), { recursive: true })
    writeFileSync(join(root, 'out/reports/report-v1.pdf'), pdf) // for a look by eye; not read back
    const pages = (pdf.toString('latin1').match(/\/Type \/Page\b/g) ?? []).length
    expect(pages).toBe(5) // summary, data + residuals, phase-folded (2 planets), periodogram, methods
    if (!existsSync('/usr/bin/pdftotext')) {
      console.log('pdftotext is missing: checked the PDF header and its page count only.')
      return
    }
    const dir = mkdtempSync(join(tmpdir(), 'starsway-pdf-'))
    try {
      writeFileSync(join(dir, 'r.pdf'), pdf)
      const text = execFileSync('/usr/bin/pdftotext', ['-layout', join(dir, 'r.pdf'), '-'], { timeout: 30_000 }).toString()
      const byPage = text.split('\f')
      expect(byPage[0]).toMatch(/Vela Sorrel: Two planets/)
      expect(byPage[0]).toMatch(/Semi-amplitude K/)
      expect(byPage[0]).toMatch(/Kestrel/)
      expect(byPage[1]).toMatch(/Radial velocities \(instrument zero points removed\) and the model/)
      expect(byPage[1]).toMatch(/Time \((BJD_TDB|JD_UTC|JD) − 2 450 000\)/)
      expect(byPage[2]).toMatch(/Planet b: P = 12\.\d+ d, phase-folded/)
      expect(byPage[3]).toMatch(/FAP 1 %/)
      expect(byPage[4]).toMatch(/Zechmeister/)
      expect(byPage[4]).toMatch(/Baluev/)
      expect(text).toMatch(/Roboto|Methods/)
    } finally { rmSync(dir, { recursive: true, force: true }) }
  })
})

describe('sharing and review', () => {
  it('shares with a team reviewer by id: e-mail with the report link', async () => {
    const reviewerId = (await reviewer.get('/api/auth/me').expect(200)).body.user.id
    const res = await analyst.post(`/api/reports/${reportId}/shares`, { userId: reviewerId, message: 'Please check planet c.' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.invited).toBe(false)
    const mail = await t.mail.waitFor((m) => m.to.includes(EMAIL.reviewer) && /shares the report/.test(m.subject))
    expect(mail.text).toContain(`${t.config.appUrl}/reports/${reportId}`)
    expect(mail.text).toContain('Please check planet c.')
  })

  it('refuses to share with someone of another team by id, and reviewers cannot share', async () => {
    const piet = (await outsider.get('/api/auth/me').expect(200)).body.user.id
    const res = await analyst.post(`/api/reports/${reportId}/shares`, { userId: piet }).expect(400)
    expect(res.body.error.field).toBe('userId')
    await reviewer.post(`/api/reports/${reportId}/shares`, { email: 'x@example.test' }).expect(403)
  })

  it('shares with an outside address: a reviewer invitation (an analyst\'s needs an owner\'s approval) and the report e-mail; after joining they can approve', async () => {
    const email = 'coauthor@elsewhere.test'
    const res = await analyst.post(`/api/reports/${reportId}/shares`, { email }).expect(201)
    expect(res.body.invited).toBe(true)
    await t.mail.waitFor((m) => m.to.includes(EMAIL.owner) && /asks to invite coauthor@elsewhere\.test/.test(m.subject))
    const pending = (await owner.get(`/api/teams/${t.seed!.teamId}/invitations`).expect(200)).body.find((i: { email: string }) => i.email === email)
    expect(pending.pendingApproval).toBe(true)
    await owner.post(`/api/teams/${t.seed!.teamId}/invitations/${pending.id}/approve`).expect(200)
    const invitation = await t.mail.waitFor((m) => m.to.includes(email) && /invites you/.test(m.subject))
    await t.mail.waitFor((m) => m.to.includes(email) && /shares the report/.test(m.subject))
    const token = /token=([A-Za-z0-9_-]+)/.exec(invitation.text)![1]!
    const co = anonymous(t.app)
    await co.post('/api/auth/register', { email, password: 'a long password', name: 'Co Author', inviteToken: token }).expect(201)
    const me = (await co.get('/api/auth/me').expect(200)).body
    expect(me.memberships.find((m: { teamId: number }) => m.teamId === t.seed!.teamId).role).toBe('reviewer')
    const detail = (await co.get(`/api/reports/${reportId}`).expect(200)).body as ReportDetail
    expect(detail.can.approve).toBe(true)
    expect(detail.can.share).toBe(false)
    await co.post(`/api/reports/${reportId}/reviews`, { version: 3, kind: 'approve' }).expect(201)
  })

  it('reviewers comment on the report and on a parameter, the author is e-mailed; unknown parameters are refused', async () => {
    const c = await reviewer.post(`/api/reports/${reportId}/reviews`, { version: 3, kind: 'comment', parameter: 'c.e', body: 'Is e of c significant?' }).expect(201)
    expect(c.body.parameter).toBe('c.e')
    const mail = await t.mail.waitFor((m) => m.to.includes(EMAIL.analyst) && /commented on/.test(m.subject))
    expect(mail.text).toMatch(/Is e of c significant\?/)
    expect(mail.text).toContain(`/reports/${reportId}`)
    const bad = await reviewer.post(`/api/reports/${reportId}/reviews`, { version: 3, kind: 'comment', parameter: 'z.K', body: 'x' }).expect(400)
    expect(bad.body.error.field).toBe('parameter')
    await reviewer.post(`/api/reports/${reportId}/reviews`, { version: 3, kind: 'comment', body: '' }).expect(400)
  })

  it('the freezer does not approve their own version; only the current version is approved', async () => {
    await analyst.post(`/api/reports/${reportId}/reviews`, { version: 3, kind: 'approve' }).expect(403)
    const old = await reviewer.post(`/api/reports/${reportId}/reviews`, { version: 1, kind: 'approve' }).expect(409)
    expect(old.body.error.message).toMatch(/does not carry over/)
  })

  it('approvals are per version, the author is told, and a new version starts unapproved', async () => {
    await reviewer.post(`/api/reports/${reportId}/reviews`, { version: 3, kind: 'request_changes', body: 'Add the trend.' }).expect(201)
    await owner.post(`/api/reports/${reportId}/reviews`, { version: 3, kind: 'approve' }).expect(201)
    await reviewer.post(`/api/reports/${reportId}/reviews`, { version: 3, kind: 'approve' }).expect(201)
    await t.mail.waitFor((m) => m.to.includes(EMAIL.analyst) && /Ines Reviewer approved/.test(m.subject))
    let d = (await analyst.get(`/api/reports/${reportId}`).expect(200)).body as ReportDetail
    const v3 = d.versions.find((v) => v.version === 3)!
    expect(v3.approvals.map((a) => [a.user.name, a.decision]).sort()).toEqual([
      ['Co Author', 'approve'], ['Ines Reviewer', 'approve'], ['Nadia Owner', 'approve'],
    ])
    // a new version: the spec changes (a trend), fit, freeze
    await analyst.patch(`/api/models/${modelId}`, { spec: { ...SPEC, trend: 'linear' } }).expect(200)
    await analyst.post(`/api/models/${modelId}/fit`, {}).expect(200)
    await analyst.post(`/api/models/${modelId}/report`, {}).expect(201)
    d = (await analyst.get(`/api/reports/${reportId}`).expect(200)).body as ReportDetail
    expect(d.currentVersion).toBe(4)
    expect(d.versions.find((v) => v.version === 4)!.approvals).toEqual([])
    expect(d.versions.find((v) => v.version === 3)!.approvals).toHaveLength(3)
    const list = (await analyst.get(`/api/stars/${starId}/reports`).expect(200)).body
    expect(list.find((r: { id: number }) => r.id === reportId).approvedVersions).toEqual([3])
    const audit = (await reviewer.get(`/api/teams/${t.seed!.teamId}/audit`).expect(200)).body as Array<{ action: string }>
    for (const a of ['report.share', 'report.comment', 'report.approve', 'report.request_changes']) expect(audit.map((x) => x.action)).toContain(a)
  })
})

describe('a sampled solution', () => {
  // A succeeded sampling run of the current version, written straight into sampling_runs (this
  // test's own numbers; the sampler itself is tested in tests/shared/rv and tests/server/jobs).
  async function fakeRun(modelVersionId: number, state = 'succeeded'): Promise<number> {
    const names = ['P b', 'K b', 'e b', 'P c', 'K c', 'e c', 'offset Kestrel', 'jitter Kestrel']
    const centre = [12.4, 9.4, 0.14, 187, 14.3, 0.25, -12.4, 1.9]
    const n = 400
    const columns = centre.map((c, j) => Array.from({ length: n }, (_, i) => c * (1 + 0.01 * Math.sin(i * (j + 1) * 0.37))))
    const result = {
      parameters: names.map((name, j) => ({ name, unit: '', median: centre[j]!, lo: centre[j]! * 0.99, hi: centre[j]! * 1.02, mean: centre[j]!, sd: centre[j]! * 0.015 })),
      sample: { names, units: names.map(() => ''), step: columns[0]!.map((_, i) => i), walker: columns[0]!.map(() => 0), columns },
      diagnostics: { names, tau: [], nOverTau: [], rhat: [], acceptance: 0.31, acceptanceMin: 0.2, acceptanceMax: 0.4, converged: true, warnings: [] },
      settings: { seed: 11, walkers: 32, steps: 2000, burn: 500, thin: 2, stepsDone: 2000, stopped: false },
      start: { lnPosterior: -500, fitStatus: 'converged' },
    }
    const [rows] = await t.db.sequelize.query(
      `INSERT INTO sampling_runs (star_id, model_id, model_version_id, model_version, settings, input, state, result, finished_at, created_at, updated_at)
       VALUES (:starId, :modelId, :mv, 1, :settings::jsonb, '{}'::jsonb, :state, :result::jsonb, now(), now(), now()) RETURNING id`,
      { replacements: { starId, modelId, mv: modelVersionId, state, settings: JSON.stringify({ walkers: 32, steps: 2000, burn: 500, thin: 2, seed: 11 }), result: JSON.stringify(result) } },
    )
    return (rows as Array<{ id: number }>)[0]!.id
  }

  it('freezes with the run: intervals in the tables, the sampler in the methods, a posterior page in the PDF', async () => {
    const current = (await analyst.get(`/api/models/${modelId}`).expect(200)).body.current
    const failed = await fakeRun(current.id, 'failed')
    expect((await analyst.post(`/api/models/${modelId}/report`, { samplingRunId: failed }).expect(400)).body.error.field).toBe('samplingRunId')
    const runId = await fakeRun(current.id)
    const res = await analyst.post(`/api/models/${modelId}/report`, { samplingRunId: runId }).expect(201)
    const v = (await reviewer.get(`/api/reports/${reportId}/versions/${res.body.currentVersion}`).expect(200)).body as ReportVersion
    expect(v.changes.map((c) => c.field)).toContain('sampling.runId')
    expect(v.snapshot.methods.references.map((r) => r.key)).toContain('GW10')
    expect(v.snapshot.methods.text).toMatch(/32 walkers for 2000 steps .*seed 11/)
    const tex = (await reviewer.get(`/api/reports/${reportId}/versions/${v.version}/latex`).expect(200)).text
    // P b: median 12.4, +0.248 −0.124 → the smaller side 0.124 has digits 124 ≤ 354: two significant
    // digits, 0.12, so both sides and the value at 0.01 (PDG rule, worked by hand)
    expect(tex).toContain('$12.40^{+0.25}_{-0.12}$')
    const pdf = (await reviewer.get(`/api/reports/${reportId}/versions/${v.version}/pdf`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = []
      r.on('data', (c: Buffer) => chunks.push(c)); r.on('end', () => cb(null, Buffer.concat(chunks)))
    }).expect(200)).body as Buffer
    expect((pdf.toString('latin1').match(/\/Type \/Page\b/g) ?? []).length).toBe(6)
    if (existsSync('/usr/bin/pdftotext')) {
      const dir = mkdtempSync(join(tmpdir(), 'starsway-pdf-'))
      try {
        writeFileSync(join(dir, 'r.pdf'), pdf)
        const text = execFileSync('/usr/bin/pdftotext', [join(dir, 'r.pdf'), '-'], { timeout: 30_000 }).toString()
        expect(text).toMatch(/posterior medians/)
        expect(text).toMatch(/Goodman/)
      } finally { rmSync(dir, { recursive: true, force: true }) }
    } else console.log('pdftotext is missing: checked the sampled PDF\'s page count only.')
  })
})
