// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import MeasurementTable from '@/components/data/MeasurementTable.vue'
import type { Measurement } from '@/api/types.ts'
import { mountWithApp, settle } from '../../mount.ts'

const point = (id: number, instrument: string, excluded = false): Measurement => ({
  id, datasetId: 1, instrument, time: 2455000 + id, rv: 10 * id, error: 1.5, indicators: {},
  excluded, excludedReason: excluded ? 'cloud' : null, excludedBy: excluded ? { id: 3, name: 'Ada' } : null,
  excludedAt: excluded ? '2026-01-02T03:04:05Z' : null,
})
const measurements = [point(1, 'North'), point(2, 'South'), point(3, 'North', true)]

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

function mountTable(canEdit = true) {
  wrapper = mountWithApp(MeasurementTable, {
    props: { measurements, offset: 2450000, timeScale: 'BJD', canEdit },
  })
  return wrapper
}

const dialog = () => document.querySelector('[data-test="exclude-dialog"]')

describe('MeasurementTable', () => {
  it('will not exclude a point without a reason', async () => {
    const w = mountTable()
    await w.find('[data-test="exclude"]').trigger('click')
    await settle()
    expect(dialog()).not.toBeNull()
    ;(document.querySelector('[data-test="exclude-confirm"]') as HTMLElement).click()
    await settle()
    expect(w.emitted('exclude')).toBeUndefined()
    expect(dialog()!.textContent).toContain('Say why this point is excluded')
  })

  it('emits the point and the trimmed reason once one is given', async () => {
    const w = mountTable()
    await w.find('[data-test="exclude"]').trigger('click')
    await settle()
    const textarea = document.querySelector('[data-test="exclude-dialog"] textarea') as HTMLTextAreaElement
    textarea.value = '  moonlight contamination '
    textarea.dispatchEvent(new Event('input'))
    await settle()
    ;(document.querySelector('[data-test="exclude-confirm"]') as HTMLElement).click()
    await settle()
    expect(w.emitted('exclude')).toEqual([[1, 'moonlight contamination']])
  })

  it('shows reason, who and when of an excluded point, and restores it without a dialog', async () => {
    const w = mountTable()
    expect(w.text()).toContain('cloud')
    expect(w.text()).toContain('Ada')
    await w.find('[data-test="restore"]').trigger('click')
    expect(w.emitted('restore')).toEqual([[3]])
  })

  it('filters by instrument and offers no controls to readers', async () => {
    const w = mountTable(false)
    expect(w.find('[data-test="exclude"]').exists()).toBe(false)
    expect(w.find('[data-test="restore"]').exists()).toBe(false)
    expect(w.attributes('data-rows')).toBe('3')
    await (w.findComponent('[data-test="instrument-filter"]') as VueWrapper).setValue(['South'])
    await settle()
    expect(w.attributes('data-rows')).toBe('1')
    expect(w.find('[data-test="measurement-count"]').text()).toBe('1 of 3 measurements')
  })
})
