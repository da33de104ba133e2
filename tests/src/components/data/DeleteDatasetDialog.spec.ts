// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import DeleteDatasetDialog from '@/components/data/DeleteDatasetDialog.vue'
import ArchiveStarDialog from '@/components/stars/ArchiveStarDialog.vue'
import type { Dataset, DatasetUsage } from '@/api/types.ts'
import { mountWithApp, settle } from '../../mount.ts'

const dataset = {
  id: 7, instrument: 'Wrongscope', fileName: 'mistake.csv', unit: 'm/s', timeFormat: 'bjd', timeScale: 'bjd_tdb', timeOffset: 0,
  count: 6, uploadedBy: { id: 2, name: 'Tomas' }, createdAt: '2026-11-30T10:00:00Z',
} as Dataset
const usage = (deletable: boolean): DatasetUsage => ({
  datasetId: 7, nMeasurements: 6, modelVersions: deletable ? 0 : 2, samplingRuns: 0, reportVersions: 0, deletable,
  reason: deletable ? null : 'Its measurements are used by 2 fitted model versions: exclude the points instead (reversible), or archive the star.',
})

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })
const q = (sel: string) => document.querySelector(sel) as HTMLElement | null

describe('DeleteDatasetDialog', () => {
  it('says what uses a dataset in use and does not offer to delete it', async () => {
    wrapper = mountWithApp(DeleteDatasetDialog, { props: { dataset, usage: usage(false) } })
    await settle()
    expect(q('[data-test="dataset-in-use"]')!.textContent).toContain('2 fitted model versions')
    expect((q('[data-test="delete-dataset-confirm"]') as HTMLButtonElement).disabled).toBe(true)
    q('[data-test="delete-dataset-confirm"]')!.click()
    await settle()
    expect(wrapper.emitted('confirm')).toBeUndefined()
  })

  it('confirms an unused dataset with the optional reason, keeping the raw file in the wording', async () => {
    wrapper = mountWithApp(DeleteDatasetDialog, { props: { dataset, usage: usage(true) } })
    await settle()
    expect(q('[data-test="dataset-deletable"]')!.textContent).toMatch(/original file\s+stays stored/)
    const input = q('[data-test="delete-dataset-reason"] input') as HTMLInputElement
    input.value = ' wrong star '
    input.dispatchEvent(new Event('input'))
    await settle()
    q('[data-test="delete-dataset-confirm"]')!.click()
    await settle()
    expect(wrapper.emitted('confirm')).toEqual([['wrong star']])
  })
})

describe('ArchiveStarDialog', () => {
  it('archives only once the star\'s name is typed', async () => {
    wrapper = mountWithApp(ArchiveStarDialog, { props: { open: true, starName: 'Vela Sorrel', nPoints: 120 } })
    await settle()
    expect(q('[data-test="archive-star-dialog"]')!.textContent).toContain('120 measurements')
    expect((q('[data-test="archive-star-confirm"]') as HTMLButtonElement).disabled).toBe(true)
    const input = q('[data-test="archive-star-name"] input') as HTMLInputElement
    input.value = 'Vela Sorrel'
    input.dispatchEvent(new Event('input'))
    await settle()
    q('[data-test="archive-star-confirm"]')!.click()
    await settle()
    expect(wrapper.emitted('confirm')).toHaveLength(1)
  })
})
