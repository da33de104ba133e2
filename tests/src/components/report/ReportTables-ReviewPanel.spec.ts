// @vitest-environment happy-dom
// The report page's solution grid (planets as columns, sections, time system) and the review panel
// (parameters named in words; an approval never carries a parameter).
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import type { ReportDetail, ReportSnapshot } from '@shared/api/reports.ts'
import { parameterChoices } from '@shared/report/solution-grid.ts'
import ReportTables from '@/components/report/ReportTables.vue'
import ReviewPanel from '@/components/report/ReviewPanel.vue'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

function planet(label: string) {
  return {
    label, period: 12.4026, K: 9.4321, e: 0.145, omegaDeg: 11.2, tp: 2458882.61, tc: 2458872.384,
    uncertainty: { period: 0.00153, K: 0.27, e: 0.027, omegaDeg: 11.3, tp: 0.4, tc: 0.121 },
    msiniMjup: 0.1012, msiniMearth: 32.04, aAu: 0.10203, derivedUncertainty: { msiniMjup: 0.0041, msiniMearth: 1.3, aAu: 0.00149 }, insolationEarth: null,
  }
}
const snapshot = {
  format: 'starsway-report/1', title: 't', frozenAt: '2026-12-02T00:00:00.000Z', frozenBy: { id: 1, name: 'A' }, product: { name: 'Starsway', version: '0.1.0', commit: null },
  star: { id: 1, name: 'Probe_1', massMsun: 0.92, massErrMsun: 0.04, radiusRsun: null, teffK: null, luminosityLsun: null, raDeg: null, decDeg: null },
  model: { id: 1, name: 'two', version: 1, versionId: 5, spec: { planets: [], trend: 'none' }, note: '', author: null, createdAt: '2026-12-02T00:00:00.000Z' },
  result: {
    planets: [planet('b'), { ...planet('c'), period: 40.1 }], instruments: [{ name: 'Kestrel_2', n: 10, offset: -12.391, offsetErr: 0.23, jitter: 1.85, jitterErr: 0.19, rms: 2.31 }],
    trend: null, stats: { chi2: 10, reducedChi2: 1, lnL: -20, bic: 50, aic: 45, rms: 2.3, nParams: 12, nPoints: 10, converged: true, status: 'converged', message: '', iterations: 12 },
    epoch: 2458800, residuals: [], warnings: [], data: { instruments: ['Kestrel_2'], nPoints: 10, nExcluded: 0, hash: 'h', firstTime: 0, lastTime: 1, baseline: 1 },
  },
  data: { hash: 'a'.repeat(64), nIncluded: 1, nExcluded: 0, instruments: ['Kestrel_2'], changedSinceFit: false, timeScale: 'bjd_tdb', points: [{ id: 1, instrument: 'Kestrel_2', time: 2458801, rv: 1, error: 1, included: true, model: 1, residual: 0 }], exclusions: [] },
  periodogram: null, residualPeriodogram: null, comparison: null, sampling: null,
  settings: { fit: { trend: 'none', instruments: null, iterations: 12, status: 'converged' }, sampling: null }, methods: { text: '', references: [] },
} as unknown as ReportSnapshot

describe('report tables', () => {
  it('lays the solution out with quantities as rows and planets as columns, times in the data\'s system', async () => {
    wrapper = mountWithApp(ReportTables, { props: { snapshot } })
    await settle()
    const head = wrapper.find('[data-test="parameter-table"] thead').text()
    expect(head).toBe('QuantityUnitbc')
    expect(wrapper.find('[data-test="param-c.period"]').text()).toBe('40.1 ± 0.0015'.replace('40.1', '40.1000'))
    expect(wrapper.text()).toContain('Times are BJD_TDB − 2 450 000')
    expect(wrapper.find('[data-test="param-b.tc"]').text()).toBe('8872.38 ± 0.12')
  })
})

describe('review panel', () => {
  const report = {
    id: 1, teamId: 1, starId: 1, starName: 'Probe_1', modelId: 1, title: 't', currentVersion: 1, createdBy: null, createdAt: '2026-12-02T00:00:00Z',
    versions: [{ id: 1, version: 1, modelVersion: 1, dataHash: 'a', samplingRunId: null, frozenBy: null, createdAt: '2026-12-02T00:00:00Z', changes: [], approvals: [] }],
    shares: [], reviews: [{ id: 1, version: 1, kind: 'comment', parameter: 'c.e', body: 'e looks high', user: { id: 2, name: 'Rev' }, createdAt: '2026-12-02T00:00:00Z' }],
    can: { freeze: false, share: false, review: true, approve: true },
  } as unknown as ReportDetail
  it('names parameters in words and sends none with an approval', async () => {
    const parameters = parameterChoices(snapshot)
    expect(parameters.find((p) => p.value === 'b.omegaDeg')!.title).toBe('Planet b: Periastron argument ω★')
    expect(parameters.find((p) => p.value === 'Kestrel_2.jitter')!.title).toBe('Kestrel_2: jitter')
    wrapper = mountWithApp(ReviewPanel, { props: { report, version: 1, parameters, busy: false, error: null } })
    await settle()
    expect(wrapper.find('[data-test="review-list"]').text()).toContain('Rev commented on “Planet c: Eccentricity e”')
    const vm = wrapper.vm as unknown as { parameter: string; body: string }
    vm.parameter = 'c.e'; vm.body = 'why so high?'
    await settle()
    await wrapper.find('[data-test="review-comment"]').trigger('click')
    vm.parameter = 'c.e'
    await settle()
    await wrapper.find('[data-test="review-approve"]').trigger('click')
    const [comment, approval] = wrapper.emitted('review')!.map((e) => e[0] as Record<string, unknown>)
    expect(comment).toMatchObject({ kind: 'comment', parameter: 'c.e' })
    expect(approval!.kind).toBe('approve')
    expect(approval!.parameter).toBeUndefined()
  })
})
