// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import type { FilePreview, PreviewResponse, TableMapping } from '@/api/types.ts'
import { mountWithApp, settle } from '../../mount.ts'

vi.mock('@/api/uploads.ts', () => ({ previewUpload: vi.fn(), commitUpload: vi.fn() }))
const api = await import('@/api/uploads.ts')
const { default: UploadWizard } = await import('@/components/upload/UploadWizard.vue')
const { useUploadStore } = await import('@/stores/upload.ts')

/** A three-column table whose error column the detection mistook for an activity indicator. */
function detected(
  overrides: Partial<TableMapping> = {}, problems: FilePreview['problems'] = [], mappingError: FilePreview['mappingError'] = null,
): PreviewResponse {
  const mapping: TableMapping = {
    delimiter: 'whitespace', hasHeader: true, unit: 'km/s', timeFormat: 'jd', instrument: 'unnamed',
    columns: [
      { index: 0, name: 'jd', role: 'time' },
      { index: 1, name: 'vrad', role: 'rv' },
      { index: 2, name: 'sig', role: 'indicator', indicator: 'sig' },
    ],
    ...overrides,
  }
  return {
    files: [{
      fileName: 'night.txt', size: 120, rowCount: 2, problemCount: problems.length, problems, mappingError, mapping,
      warnings: [], warningCount: 0, flaggedCount: 0, duplicateOf: null, overlap: null, notices: [],
      instruments: [{ name: 'unnamed', count: 2 }],
      detection: {
        mapping, format: 'delimited', headerNames: ['jd', 'vrad', 'sig'], headerFromComment: false, headerLine: 1, columnCount: 3,
        rowCount: 2, commentLines: 0, notes: ['Read "vrad" as velocity in km/s.'],
        preview: [{ line: 2, cells: ['2455000.1', '1.234', '0.002'] }, { line: 3, cells: ['2455001.2', '1.240', '0.003'] }],
      },
      rows: [
        { line: 2, time: 2455000.1, rv: 1234, error: 2, instrument: 'unnamed', indicators: {} },
        { line: 3, time: 2455001.2, rv: 1240, error: 3, instrument: 'unnamed', indicators: {} },
      ],
    }],
    descriptions: [],
  }
}

let wrapper: VueWrapper | undefined
beforeEach(() => { vi.mocked(api.previewUpload).mockReset(); vi.mocked(api.commitUpload).mockReset() })
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

async function openColumnsStep(first: PreviewResponse) {
  vi.mocked(api.previewUpload).mockResolvedValueOnce(first)
  wrapper = mountWithApp(UploadWizard, { props: { starId: 7 } })
  useUploadStore().setFiles([new File(['jd vrad sig\n2455000.1 1.234 0.002\n'], 'night.txt', { type: 'text/plain' })])
  await settle()
  await wrapper.find('[data-test="detect"]').trigger('click')
  await settle()
  return wrapper
}

describe('UploadWizard, correcting the detected columns', () => {
  it('shows what was detected and asks for an error for all rows while no column holds errors', async () => {
    const w = await openColumnsStep(detected({}, [], { code: 'missing_error', message: 'No error column: give one error for all rows.' }))
    expect(api.previewUpload).toHaveBeenCalledWith(7, expect.any(Array))
    expect(w.text()).toContain('Read "vrad" as velocity in km/s.')
    expect(w.find('[data-test="default-error"]').exists()).toBe(true)
    expect(w.text()).toContain('Choose the error column, or give one error for all rows.')
    expect(w.find('[data-test="to-rows"]').attributes('disabled')).toBeDefined()
  })

  it('sends the corrected mapping as it stands when reading again (no hints round trip), and adopts the mapping read with', async () => {
    const w = await openColumnsStep(detected())
    const roleSelect = w.findComponent('[data-test="role-2"]') as VueWrapper
    await roleSelect.setValue('error')
    await settle()
    const store = useUploadStore()
    expect(store.mappings['night.txt']!.columns[2]!.role).toBe('error')
    expect(w.find('[data-test="default-error"]').exists()).toBe(false)

    const corrected = detected({
      columns: [
        { index: 0, name: 'jd', role: 'time' }, { index: 1, name: 'vrad', role: 'rv' }, { index: 2, name: 'sig', role: 'error' },
      ],
    })
    vi.mocked(api.previewUpload).mockResolvedValueOnce(corrected)
    await w.find('[data-test="recheck"]').trigger('click')
    await settle()
    expect(api.previewUpload).toHaveBeenCalledTimes(2)
    const [, , hints, sent] = vi.mocked(api.previewUpload).mock.calls[1]!
    expect(hints).toBeUndefined()
    expect(sent!['night.txt']!.columns.map((c) => c.role)).toEqual(['time', 'rv', 'error'])
    expect(sent!['night.txt']).toMatchObject({ unit: 'km/s', timeFormat: 'jd', hasHeader: true, instrument: 'unnamed' })
    expect(store.mappings['night.txt']!.columns.map((c) => c.role)).toEqual(['time', 'rv', 'error'])
    expect(w.find('[data-test="to-rows"]').attributes('disabled')).toBeUndefined()
  })

  it('keeps one time column: choosing time for another column frees the old one', async () => {
    const w = await openColumnsStep(detected())
    await (w.findComponent('[data-test="role-1"]') as VueWrapper).setValue('time')
    await settle()
    const roles = useUploadStore().mappings['night.txt']!.columns.map((c) => c.role)
    expect(roles).toEqual(['ignore', 'time', 'indicator'])
    expect(w.text()).toContain('Choose the velocity column.')
  })

  it('commits the corrected mapping and lists the row problems of a refused save', async () => {
    const w = await openColumnsStep(detected())
    await w.find('[data-test="default-error"] input').setValue('0.004')
    await settle()
    expect(useUploadStore().mappings['night.txt']!.defaultError).toBe(0.004)
    vi.mocked(api.previewUpload).mockResolvedValueOnce(detected({ defaultError: 0.004 }))
    await w.find('[data-test="to-rows"]').trigger('click')
    await settle()
    await w.find('[data-test="to-save"]').trigger('click')
    await settle()
    const { ApiError } = await import('@/api/http.ts')
    vi.mocked(api.commitUpload).mockRejectedValueOnce(new ApiError(400, 'validation', 'night.txt: line 3: error must be positive', undefined,
      { problems: [{ fileName: 'night.txt', line: 3, column: 'sig', message: 'error must be positive' }] }))
    await w.find('[data-test="commit"]').trigger('click')
    await settle()
    const mappings = vi.mocked(api.commitUpload).mock.calls[0]![2]
    expect(mappings['night.txt']).toMatchObject({ unit: 'km/s', defaultError: 0.004 })
    expect(w.find('[data-test="commit-error"]').text()).toContain('line 3: error must be positive')
    expect(w.text()).toContain('night.txt line 3, sig: error must be positive')
    expect(w.emitted('saved')).toBeUndefined()
  })
})

describe('UploadWizard, questions, units and save choices (issue 10)', () => {
  const question = { field: 'timeFormat' as const, message: 'Times near 59346: are they MJD (JD − 2400000.5) or JD − 2400000?', choices: [{ value: 'jd-2400000', label: 'JD − 2400000' }, { value: 'mjd', label: 'MJD' }] }

  it('an open question blocks the rows step until answered; the answer sets the time format', async () => {
    const w = await openColumnsStep(detected({ timeFormat: 'jd-2400000', questions: [question],
      columns: [{ index: 0, name: 'jd', role: 'time' }, { index: 1, name: 'vrad', role: 'rv' }, { index: 2, name: 'sig', role: 'error' }] }))
    expect(w.find('[data-test="question"]').text()).toContain('MJD (JD − 2400000.5) or JD − 2400000?')
    expect(w.find('[data-test="to-rows"]').attributes('disabled')).toBeDefined()
    // the reader's first guess is not shown as chosen while the question is open
    expect(w.find('[data-test="time-label"]').text()).toBe('not yet known')
    expect(w.find('[data-test="time-format"]').text()).toContain('Not yet known')
    await w.find('[data-test="answer-mjd"] input').setValue(true)
    await settle()
    const m = useUploadStore().mappings['night.txt']!
    expect(m.timeFormat).toBe('mjd')
    expect(m.questions).toBeUndefined()
    expect(w.find('[data-test="to-rows"]').attributes('disabled')).toBeUndefined()
    expect(w.find('[data-test="time-label"]').text()).toBe('MJD')
  })

  it('each velocity column has its own unit; the error column can be m/s under a km/s velocity', async () => {
    const w = await openColumnsStep(detected({ columns: [{ index: 0, name: 'jd', role: 'time' }, { index: 1, name: 'vrad', role: 'rv' }, { index: 2, name: 'sig', role: 'error' }] }))
    await (w.findComponent('[data-test="unit-2"]') as VueWrapper).setValue('m/s')
    await settle()
    expect(useUploadStore().mappings['night.txt']!.columns[2]).toMatchObject({ role: 'error', unit: 'm/s' })
    await (w.findComponent('[data-test="unit-2"]') as VueWrapper).setValue('furlongs')
    await settle()
    expect(useUploadStore().mappings['night.txt']!.columns[2]!.unit).toBe('m/s')
  })

  it('sends "skip problem rows" and the overlap choice with the save', async () => {
    const first = detected({ columns: [{ index: 0, name: 'jd', role: 'time' }, { index: 1, name: 'vrad', role: 'rv' }, { index: 2, name: 'sig', role: 'error' }] },
      [{ line: 3, column: 'sig', message: 'error must be positive' }])
    first.files[0]!.overlap = { count: 1, examples: [{ line: 2, time: 2455000.1, instrument: 'unnamed', earlierFile: 'old.txt' }] }
    const w = await openColumnsStep(first)
    await w.find('[data-test="to-rows"]').trigger('click')
    await settle()
    await w.find('[data-test="to-save"]').trigger('click')
    await settle()
    await w.find('[data-test="skip-problems"] input').setValue(true)
    await w.find('[data-test="overlap-choice"] input[value="skip"]').setValue(true)
    await settle()
    vi.mocked(api.commitUpload).mockResolvedValueOnce({ datasets: [], measurementsCreated: 1, skipped: [], notices: [] })
    await w.find('[data-test="commit"]').trigger('click')
    await settle()
    expect(vi.mocked(api.commitUpload).mock.calls[0]![3]).toEqual({ overlap: 'skip', skipProblemRows: true })
  })
})
