// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import type { TriageRow, TriageSummary } from '@shared/api/survey.ts'
import { mountWithApp, settle } from '../../mount.ts'
import TriageTable from '@/components/survey/TriageTable.vue'

// links are checked by their target, without a router
const RouterLink = { props: ['to'], template: '<a :data-to="JSON.stringify(to)"><slot /></a>' }
const mountTable = () => mountWithApp(TriageTable, { props: { rows, loading: false }, global: { stubs: { RouterLink } } })

const summary = (o: Partial<TriageSummary>): TriageSummary => ({
  points: 40, instruments: 1, baseline: 120, strongestPeriod: 12.3, strongestFap: 1e-6, deltaBic: 40, keplerianFap: 1e-5,
  candidates: 1, planets: 1, activity: false, indicators: [], trend: 'none', signals: [], flags: [], ...o,
})
const row = (id: number, name: string, s: TriageSummary | null, state: TriageRow['state'] = 'done'): TriageRow => ({
  starId: id, starName: name, resultId: id, runId: 1, state, attempts: 1, error: null, summary: s, queuedAt: '2026-12-01T00:00:00Z', finishedAt: s ? '2026-12-01T00:01:00Z' : null,
})
const rows = [
  row(1, 'Planet star', summary({})),
  row(2, 'Quiet star', summary({ deltaBic: 2, candidates: 0, planets: 0, strongestPeriod: 3.1, strongestFap: 0.4 })),
  row(3, 'Spotted star', summary({ deltaBic: 25, candidates: 1, planets: 0, activity: true })),
  row(4, 'Waiting star', null, 'queued'),
]

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

const names = () => wrapper!.findAll('[data-test="triage-table"] tbody tr').map((r) => r.text())

describe('TriageTable', () => {
  it('lists every star, strongest ΔBIC first, with a link into its analysis', async () => {
    wrapper = mountTable()
    await settle()
    const text = names()
    expect(text).toHaveLength(4)
    expect(text[0]).toContain('Planet star')
    expect(text[1]).toContain('Spotted star')
    expect(JSON.parse(wrapper.find('[data-test="triage-table"] tbody a').attributes('data-to')!)).toEqual({ name: 'analysis', params: { starId: 1 } })
    expect(wrapper.text()).toContain('4 of 4 stars')
  })

  it('filters by ΔBIC, candidates and the activity flag', async () => {
    wrapper = mountTable()
    await settle()
    await wrapper.find('[data-test="filter-dbic"] input').setValue('10')
    await settle()
    expect(names().map((t) => t.slice(0, 12))).toEqual(['Planet star4', 'Spotted star'])
    expect(wrapper.text()).toContain('2 of 4 stars')
    await wrapper.find('[data-test="filter-dbic"] input').setValue('')
    await wrapper.find('[data-test="filter-candidates"] input').setValue(true)
    await settle()
    expect(wrapper.text()).toContain('2 of 4 stars')
  })
})
