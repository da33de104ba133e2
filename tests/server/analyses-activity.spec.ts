// Activity through the API on the demo's spotted star Tarn Meridian (no planet; spots rotating at
// ~23 d that the bisector span and S-index follow: fixtures/demo/README.md): a fit with a GP noise
// model, pinned jitters, the search's activity candidates, the one-click overrule recorded as a model
// version and an audit entry, and "planets + GP" beside "planets + white noise" in the comparison.
import { execFileSync } from 'node:child_process'
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'
import type { CompareResponse, ModelDetail, SearchResponse } from '../../shared/api/analyses.ts'
import type { ReportVersion } from '../../shared/api/reports.ts'

// fixtures/demo/README.md: rotation 23 d, spot lifetime ≈ 45 d; Kestrel jitter 1.5, Osprey 1.8 m/s.
const TARN_ROTATION = 23

let t: TestApp
let a: Client
let tarn: number
let search: SearchResponse
let gpModelId: number

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  a = await signIn(t.app, 'tomas.analyst@lanternfield.test')
  tarn = t.seed!.starIds!['Tarn Meridian']!
  const res = await a.post(`/api/stars/${tarn}/search`, { maxPlanets: 2 })
  expect(res.status, JSON.stringify(res.body).slice(0, 400)).toBe(201)
  search = res.body
}, 600_000)
afterAll(async () => { await t?.close() })

async function fit(name: string, spec: object): Promise<ModelDetail> {
  const created = await a.post(`/api/stars/${tarn}/models`, { name, spec })
  expect(created.status, JSON.stringify(created.body)).toBe(201)
  const res = await a.post(`/api/models/${created.body.id}/fit`, {})
  expect(res.status, JSON.stringify(res.body).slice(0, 400)).toBe(200)
  return res.body
}

describe('noise models in the fit', () => {
  it('fits planets + GP (rotation kernel) and states the noise model: hyperparameters with errors and units, priors, ln L, BIC', async () => {
    const m = await fit('GP only', { planets: [], noise: { kind: 'gp', kernel: 'rotation', period: { value: 23.4, source: 'a test value' } } })
    const r = m.current.result!
    gpModelId = m.id
    expect(m.current.status).toBe('fitted')
    expect(r.noise?.kind).toBe('gp')
    expect(r.noise?.solver).toMatch(/semiseparable/)
    const prot = r.noise!.hyperparameters.find((h) => h.symbol === 'P_rot')!
    expect(prot.unit).toBe('d')
    expect(Math.abs(prot.value - TARN_ROTATION)).toBeLessThan(2.5)
    expect(prot.error).toBeGreaterThan(0)
    expect(r.noise!.hyperparameters.find((h) => h.symbol === 'h')!.unit).toBe('m/s')
    expect(r.noise!.priors.join(' ')).toMatch(/rotation period ~ N\(23\.4.*from a test value/)
    expect(r.noise!.lnL).toBeCloseTo(r.stats.lnL!, 6)
    expect(r.noise!.model!.instruments).toEqual(['Kestrel', 'Osprey'])
    // the activity curve at every row; residual − activity is much smaller than the residual
    const rms = (xs: number[]) => Math.sqrt(xs.reduce((s, x) => s + x * x, 0) / xs.length)
    expect(r.residuals.every((x) => typeof x.activity === 'number')).toBe(true)
    expect(rms(r.residuals.map((x) => x.residual - x.activity!))).toBeLessThan(0.6 * rms(r.residuals.map((x) => x.residual)))

    // the same star with white noise only: the GP is preferred by BIC
    const white = await fit('white only', { planets: [] })
    expect(white.current.result!.noise?.kind).toBe('white')
    expect(r.stats.bic!).toBeLessThan(white.current.result!.stats.bic! - 10)
  }, 600_000)

  it('pins jitters (all, or some with the others fitted) and refuses unknown instruments', async () => {
    const all = await fit('pinned', { planets: [], instrumentTerms: [{ instrument: 'Kestrel', jitter: 2 }, { instrument: 'Osprey', jitter: 3 }] })
    expect(all.current.result!.instruments.map((i) => i.jitter)).toEqual([2, 3])
    expect(all.current.result!.noise!.pinnedJitters).toEqual([{ instrument: 'Kestrel', jitter: 2 }, { instrument: 'Osprey', jitter: 3 }])
    const free = await fit('free', { planets: [] })
    const some = await fit('one pinned', { planets: [], instrumentTerms: [{ instrument: 'Kestrel', jitter: 2 }] })
    const [k, o] = some.current.result!.instruments
    expect(k!.jitter).toBe(2)
    expect(o!.jitter).toBeGreaterThan(0)
    expect(o!.jitterErr).toBeNull()
    // the free jitter is at its maximum-likelihood value: close to the all-free fit's (offsets barely change)
    expect(Math.abs(o!.jitter! - free.current.result!.instruments[1]!.jitter!)).toBeLessThan(0.5)
    expect(some.current.result!.stats.nParams).toBe(free.current.result!.stats.nParams - 1)

    const bad = await a.post(`/api/stars/${tarn}/models`, { name: 'x', spec: { planets: [], instrumentTerms: [{ instrument: 'Nowhere', jitter: 1 }] } })
    expect(bad.status).toBe(400)
    expect(bad.body.error.field).toBe('spec.instrumentTerms')
    const badGp = await a.post(`/api/stars/${tarn}/models`, { name: 'x', spec: { planets: [], noise: { kind: 'gp', period: { value: 23 }, decayTime: { fixed: true } } } })
    expect(badGp.status).toBe(400)
    expect(badGp.body.error.field).toBe('spec.noise.decayTime.value')
  }, 600_000)
})

describe('the search weighs activity', () => {
  it('labels the rotation signal an activity candidate with its evidence and leaves it out of the model', () => {
    const act = search.report.activity!
    expect(act).toBeTruthy()
    expect(act.indicators.map((i) => i.name).sort()).toEqual(['bisector_span', 'fwhm', 's_index'])
    const labelled = act.candidates.filter((c) => c.activity)
    expect(labelled.length).toBeGreaterThan(0)
    const rot = labelled.find((c) => Math.abs(c.period - TARN_ROTATION) < 2 || Math.abs(c.period - TARN_ROTATION / 2) < 1)
    expect(rot, JSON.stringify(act.candidates.map((c) => [c.period, c.activity]))).toBeTruthy()
    expect(rot!.matches.length).toBeGreaterThan(0)
    expect(rot!.cautions.join(' ')).toMatch(/not a planet/)
    expect(search.model.current.spec.planets.length).toBe(search.model.planets)
    expect(search.model.current.spec.planets.every((p) => labelled.every((c) => Math.abs(p.period - c.period) > 1e-6))).toBe(true)
    expect(search.report.flags.some((f) => f.kind === 'activity' && f.severity === 'rejection')).toBe(true)
    // the same search as the CLI's for a table with indicators: planets + GP is kept when its BIC is lower
    expect(search.model.current.spec.noise?.kind).toBe('gp')
    expect(search.model.current.result!.noise?.kind).toBe('gp')
    expect(search.report.activity!.cautions.join(' ')).toMatch(/Planets \+ GP preferred: BIC/)
    expect(search.model.name).toMatch(/\+ GP$/)
  })

  it('overrules a label with one click: a new fitted version whose note says who, which period, why; audited', async () => {
    const cand = search.report.activity!.candidates.find((c) => c.activity)!
    const modelId = search.model.id
    const missing = await a.post(`/api/models/${modelId}/overrule`, { signal: cand.signal })
    expect(missing.status).toBe(400)
    expect(missing.body.error.field).toBe('reason')
    const res = await a.post(`/api/models/${modelId}/overrule`, { signal: cand.signal, reason: 'seen in transit photometry' })
    expect(res.status, JSON.stringify(res.body).slice(0, 400)).toBe(200)
    const m: ModelDetail = res.body
    expect(m.currentVersion).toBe(2)
    expect(m.current.spec.planets.length).toBe(search.model.planets + 1)
    expect(m.current.status).toBe('fitted')
    expect(m.current.note).toMatch(/Tomas.* overruled the .*-d activity label \(.*(peak at|follows).*\): counted as a planet\. Reason: seen in transit photometry/)
    expect(m.current.note).toContain(cand.period.toPrecision(4))
    const marked = m.current.result!.search!.activity!.candidates.find((c) => c.signal === cand.signal)!
    expect(marked.overruled?.reason).toBe('seen in transit photometry')
    expect(marked.overruled?.by?.name).toMatch(/Tomas/)
    // the first version is kept as it was
    const v1 = await a.get(`/api/models/${modelId}/versions/1`).expect(200)
    expect(v1.body.spec.planets.length).toBe(search.model.planets)
    // twice → 409
    expect((await a.post(`/api/models/${modelId}/overrule`, { signal: cand.signal, reason: 'again' })).status).toBe(409)
    const audit = await a.get(`/api/teams/${t.seed!.teamId}/audit`).expect(200)
    const items = (audit.body.items ?? audit.body) as Array<{ action: string; entityId: number; detail: Record<string, unknown> }>
    const entry = items.find((e) => e.action === 'model.overrule' && e.entityId === modelId)
    expect(entry?.detail.period).toBeCloseTo(cand.period, 6)
    expect(entry?.detail.reason).toBe('seen in transit photometry')
    expect((entry?.detail.evidence as string[]).join(' ')).toMatch(/not a planet/)
  }, 600_000)

  it('offers planets + GP beside planets + white noise: P_rot from the strongest indicator peak, fitted, compared', async () => {
    const white = await fit('white for GP', { planets: [] })
    const res = await a.post(`/api/models/${white.id}/gp-variant`, {})
    expect(res.status, JSON.stringify(res.body).slice(0, 400)).toBe(201)
    const gp: ModelDetail = res.body
    expect(gp.name).toBe('white for GP + GP')
    expect(gp.current.status).toBe('fitted')
    const noise = gp.current.spec.noise
    expect(noise?.kind).toBe('gp')
    if (noise?.kind !== 'gp') return
    expect(Math.abs(noise.period.value - TARN_ROTATION)).toBeLessThan(3)
    expect(noise.period.source).toMatch(/'(bisector_span|fwhm|s_index)' periodogram peak \(FAP/)
    expect(gp.versions[0]!.note).toMatch(/planets \+ GP from model/)
    const cmp: CompareResponse = (await a.get(`/api/stars/${tarn}/models/compare`).expect(200)).body
    const rowGp = cmp.rows.find((r) => r.modelId === gp.id)!
    const rowWhite = cmp.rows.find((r) => r.modelId === white.id)!
    expect(rowGp.comparable && rowWhite.comparable).toBe(true)
    expect(rowGp.bic).toBeLessThan(rowWhite.bic)
    // a star without indicators and no period given → 400 naming the field
    const reviewerless = await a.post(`/api/models/${white.id}/gp-variant`, { period: -1 })
    expect(reviewerless.status).toBe(400)
    expect(reviewerless.body.error.field).toBe('period')
  }, 600_000)

  it('planets + GP keeps the model\'s planet fixes and priors, and the GP fit holds them', async () => {
    const white = await fit('fixed for GP', { planets: [{ period: 7.3, K: 2, e: 0, fix: ['period', 'e'], priors: [{ param: 'K', gaussian: { mu: 2, sigma: 0.5 } }] }] })
    expect(white.current.result!.planets[0]!.e, 'white fit holds e').toBe(0)
    const res = await a.post(`/api/models/${white.id}/gp-variant`, { period: 23 })
    expect(res.status, JSON.stringify(res.body).slice(0, 400)).toBe(201)
    const gp: ModelDetail = res.body
    const planet = gp.current.spec.planets[0]!
    expect(planet.fix).toEqual(['period', 'e'])
    expect(planet.priors).toEqual([{ param: 'K', gaussian: { mu: 2, sigma: 0.5 } }])
    expect(gp.current.result!.planets[0]!.period).toBe(7.3)
    expect(gp.current.result!.planets[0]!.e, JSON.stringify(gp.current.result!.planets[0])).toBe(0)
    expect(gp.versions[0]!.note).not.toMatch(/dropped/)
  }, 600_000)
})

describe('the report states the noise model', () => {
  it('methods text, solution grid, LaTeX and PDF carry the kernel, hyperparameters with errors and the priors', async () => {
    const frozen = await a.post(`/api/models/${gpModelId}/report`, {})
    expect(frozen.status, JSON.stringify(frozen.body).slice(0, 400)).toBe(201)
    const v: ReportVersion = (await a.get(`/api/reports/${frozen.body.id}/versions/1`).expect(200)).body
    const m = v.snapshot.methods
    expect(m.text).toMatch(/Gaussian process/)
    expect(m.text).toMatch(/rotation kernel .* O\(N\) semiseparable solver \(Foreman-Mackey et al\. 2017\)/)
    expect(m.text).toMatch(/rotation period P_rot = 2\d\.\d+ ± \d/)
    expect(m.text).toMatch(/with priors: rotation period ~ N\(23\.4/)
    expect(m.references.map((r) => r.key)).toEqual(expect.arrayContaining(['FM17', 'RW06', 'Ford06']))
    const { solutionGrid } = await import('../../shared/report/solution-grid.ts')
    const g = solutionGrid(v.snapshot)
    const sec = g.sections.find((x) => x.title.startsWith('Noise model'))!
    expect(sec.title).toBe('Noise model (GP, rotation kernel)')
    expect(sec.rows.map((r) => r.id)).toEqual(['noise.P_rot', 'noise.τ_d', 'noise.f', 'noise.h'])
    expect(sec.rows[0]!.cells[0]!.error).toBeGreaterThan(0)
    expect(sec.note).toMatch(/^GP priors: rotation period ~ N/)
    const tex = (await a.get(`/api/reports/${frozen.body.id}/versions/1/latex`).expect(200)).text
    expect(tex).toContain('\\emph{Noise model}')
    expect(tex).toMatch(/Rotation period \$P_\\mathrm\{rot\}\$ & d & \\multicolumn\{1\}\{c\}\{\$2\d\.\d+ \\pm/)
    expect(tex).toMatch(/GP priors: rotation period \\textasciitilde\{\} N\(23\.4\d*, [\d.]+\$\^2\$\) d/)
    const pdf = await a.get(`/api/reports/${frozen.body.id}/versions/1/pdf`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c)); res.on('end', () => cb(null, Buffer.concat(chunks)))
    })
    expect(pdf.status).toBe(200)
    const pdflatex = ['/usr/bin/pdflatex', '/usr/local/bin/pdflatex'].find((p) => existsSync(p))
    if (!pdflatex) { console.log('pdflatex is not installed here: the LaTeX table was checked as text only, not compiled.'); return }
    const dir = mkdtempSync(join(tmpdir(), 'starsway-gp-tex-'))
    try {
      writeFileSync(join(dir, 'paper.tex'), `\\documentclass{article}\n\\begin{document}\n${tex}\n\\end{document}\n`)
      execFileSync(pdflatex, ['-interaction=nonstopmode', '-halt-on-error', 'paper.tex'], { cwd: dir, stdio: 'pipe', timeout: 60_000 })
      expect(existsSync(join(dir, 'paper.pdf'))).toBe(true)
    } finally { rmSync(dir, { recursive: true, force: true }) }
  }, 600_000)
})
