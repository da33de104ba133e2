import { defineStore } from 'pinia'
import { fetchPeriodogramFull } from '@/api/periodogram-full.ts'
import { computed, reactive, ref } from 'vue'
import * as api from '@/api/analyses.ts'
import { modelSpecSchema } from '@shared/api/analyses.ts'
import type {
  CompareResponse, ModelDetail, ModelSpecInput, ModelVersion, ModelSummary, PeriodogramRun, RunPeriodogramRequest, SearchRequest, SearchResponse,
} from '@shared/api/analyses.ts'
import {
  defaultModelName, planetForm, planetFormFromFit, specToForm, type ModelForm,
} from '@/components/analysis/model-form.ts'
import { asyncState, track, type AsyncState } from './async-state.ts'
import type { RotationSuggestion } from '@/components/analysis/noise-form.ts'

export type PeriodogramSettings = Pick<RunPeriodogramRequest, 'minPeriod' | 'maxPeriod' | 'oversample' | 'instruments'>
/** Options of the automatic search (blank: the core's defaults, as in the CLI). */
export type SearchSettings = Pick<SearchRequest, 'minPeriod' | 'maxPeriod' | 'maxPlanets'>

/**
 * The analysis of one star: periodograms (velocities, indicators, residuals of the selected model),
 * the saved models, the model being edited, the automatic search and the comparison.
 */
export const useAnalysisStore = defineStore('analysis', () => {
  let starId: number | null = null
  let instruments: string[] = []

  const rv = asyncState<PeriodogramRun>()
  const residuals = asyncState<PeriodogramRun>()
  const indicators = reactive<Record<string, AsyncState<PeriodogramRun>>>({})
  const settings = reactive<PeriodogramSettings>({})
  const searchSettings = reactive<SearchSettings>({})

  const models = asyncState<ModelSummary[]>([])
  /** The selected saved model (its current version is what the plots and results show). */
  const selected = asyncState<ModelDetail>()
  const fitting = asyncState<ModelDetail>()
  const compare = asyncState<CompareResponse>()
  const search = asyncState<SearchResponse>()

  /** The form being edited, and the saved model it belongs to (null: a new model, saved on fit). */
  const form = ref<ModelForm>({ name: defaultModelName(0, 'none'), trend: 'none', instruments: [], planets: [] })
  const formModelId = ref<number | null>(null)
  const fitStartedAt = ref<number | null>(null)

  const fitted = computed(() => (selected.data?.current.status === 'fitted' ? selected.data.current : null))

  function reset(id: number, names: string[]) {
    starId = id
    instruments = [...names]
    for (const s of [rv, residuals, selected, fitting, compare, search]) { s.data = null; s.error = null; s.apiError = null }
    for (const key of Object.keys(indicators)) delete indicators[key]
    models.data = []
    form.value = { name: defaultModelName(0, 'none'), trend: 'none', instruments: [...names], planets: [] }
    formModelId.value = null
  }

  /** Opens a star: its models and comparison, and the newest saved periodograms. */
  async function load(id: number, names: string[], canRun = false) {
    if (starId !== id) reset(id, names)
    else { instruments = [...names]; if (form.value.instruments.length === 0) form.value.instruments = [...names] }
    await Promise.all([
      track(models, () => api.listModels(id)),
      track(compare, () => api.compareModels(id)),
      loadSavedPeriodograms(id),
    ])
    // Opening a star with saved work shows its preferred (or newest fitted) model.
    const pick = compare.data?.preferredModelId ?? models.data?.find((m) => m.status === 'fitted')?.id
    if (!selected.data && pick !== undefined && starId === id) await selectModel(pick, canRun)
  }

  async function loadSavedPeriodograms(id: number) {
    try {
      const list = await api.listPeriodograms(id)
      const newestRv = list.find((p) => p.kind === 'rv')
      const jobs: Promise<unknown>[] = []
      if (newestRv && !rv.data) jobs.push(track(rv, () => api.fetchPeriodogram(newestRv.id)))
      const seen = new Set<string>()
      for (const p of list) {
        if (p.kind !== 'indicator' || !p.indicator || seen.has(p.indicator)) continue
        seen.add(p.indicator)
        const state = asyncState<PeriodogramRun>()
        indicators[p.indicator] = state
        jobs.push(track(state, () => api.fetchPeriodogram(p.id)))
      }
      await Promise.all(jobs)
    } catch {
      // An empty history is no error for the page; running a periodogram reports its own errors.
    }
  }

  function need(): number {
    if (starId === null) throw new Error('No star is open')
    return starId
  }

  const runRv = () => track(rv, () => api.runPeriodogram(need(), { kind: 'rv', ...settings }))

  async function runIndicator(name: string) {
    if (!indicators[name]) indicators[name] = asyncState<PeriodogramRun>()
    await track(indicators[name]!, () => api.runPeriodogram(need(), { kind: 'indicator', indicator: name, ...settings }))
  }

  async function runResiduals() {
    const version = fitted.value
    if (!version) return null
    return track(residuals, () => api.runPeriodogram(need(), { kind: 'residuals', modelVersionId: version.id, ...settings }))
  }

  /** The newest saved residual periodogram of the selected version; a new one only when none is saved and the user may run one. */
  async function showResiduals(canRun: boolean) {
    const version = fitted.value
    if (!version) return null
    const id = need()
    const saved = await api.listPeriodograms(id).then((list) => list.find((p) => p.kind === 'residuals' && p.modelVersionId === version.id), () => undefined)
    if (saved) return track(residuals, () => api.fetchPeriodogram(saved.id))
    return canRun ? runResiduals() : null
  }

  /**
   * Adds a planet at `period` with start K (m/s) and e = 0. A planet added to a fitted model starts a
   * new model (the fitted one stays for comparison) whose other planets start at their fitted values.
   */
  function addPlanet(period: number, K: number) {
    const version = fitted.value
    if (version && formModelId.value === version.modelId && version.result) {
      const planets = version.result.planets.map(planetFormFromFit)
      form.value = {
        name: defaultModelName(planets.length + 1, version.spec.trend),
        trend: version.spec.trend, instruments: version.spec.instruments ? [...version.spec.instruments] : [...instruments],
        planets: [...planets, planetForm(period, K, 0)],
      }
      formModelId.value = null
      return
    }
    form.value.planets.push(planetForm(period, K, 0))
    if (formModelId.value === null) form.value.name = defaultModelName(form.value.planets.length, form.value.trend)
  }

  /** Starts a new, empty model form (keeps the saved ones). */
  function newModel() {
    form.value = { name: defaultModelName(0, 'none'), trend: 'none', instruments: [...instruments], planets: [] }
    formModelId.value = null
  }

  function editFrom(detail: ModelDetail) {
    form.value = specToForm(detail.name, detail.current.spec, instruments)
    formModelId.value = detail.id
  }

  /** Selects a saved model: its current version fills the form, the plots and the residual periodogram. */
  async function selectModel(modelId: number, canRun = true) {
    const detail = await track(selected, () => api.fetchModel(modelId))
    if (detail) {
      editFrom(detail)
      residuals.data = null
      residuals.error = null
      if (detail.current.status === 'fitted') await showResiduals(canRun)
    }
  }

  /**
   * Saves the form (a new model, or a new version of the one it belongs to) and fits it; then the
   * lists, the comparison and the residual periodogram follow.
   */
  async function fit(name: string, spec: ModelSpecInput, asNew = false) {
    const id = need()
    fitStartedAt.value = Date.now()
    try {
      const detail = await track(fitting, async () => {
        let modelId = asNew ? null : formModelId.value
        if (modelId === null) {
          modelId = (await api.createModel(id, { name, spec })).id
        } else {
          const saved = selected.data?.id === modelId ? selected.data : await api.fetchModel(modelId)
          if (saved.name !== name || JSON.stringify(modelSpecSchema.parse(saved.current.spec)) !== JSON.stringify(modelSpecSchema.parse(spec))) {
            await api.updateModel(modelId, { name, spec })
          }
        }
        return api.fitModel(modelId)
      })
      if (!detail) return null
      selected.data = detail
      selected.error = null
      formModelId.value = detail.id
      form.value.name = detail.name
      await refreshAround(id, detail.current.status === 'fitted')
      return detail
    } finally {
      fitStartedAt.value = null
    }
  }

  /** The automatic search (the core's searchPlanets with its defaults unless set in `searchSettings`). */
  async function runSearch() {
    const id = need()
    const found = await track(search, () => api.searchSignals(id, { trend: 'auto', ...searchSettings }))
    if (!found) return null
    selected.data = found.model
    editFrom(found.model)
    await refreshAround(id, true)
    return found
  }

  /**
   * The strongest significant activity-indicator peak (FAP below 0.001, the vetting's level) of the
   * indicator periodograms on the page, else of the search's indicator diagnostics: the GP's P_rot offer.
   */
  const rotationSuggestion = computed<RotationSuggestion | null>(() => {
    let best: RotationSuggestion | null = null
    const offer = (indicator: string, period: number, fap: number) => {
      if (fap < 1e-3 && (!best || fap < best.fap)) best = { indicator, period, fap }
    }
    for (const [name, state] of Object.entries(indicators)) {
      const top = state.data?.result.peaks[0]
      if (top) offer(name, top.period, top.fap)
    }
    if (!best) for (const d of search.data?.report.activity?.indicators ?? selected.data?.current.result?.search?.activity?.indicators ?? []) {
      const top = d.peaks[0]
      if (top) offer(d.name, top.period, top.fap)
    }
    return best
  })

  /** After a change made on the server (overrule, planets + GP): select the model, refresh lists, comparison and residuals. */
  async function showChanged(detail: ModelDetail | null) {
    if (!detail) return null
    const id = need()
    selected.data = detail
    selected.error = null
    editFrom(detail)
    await refreshAround(id, detail.current.status === 'fitted')
    return detail
  }

  /** After the selected model changed: the model list, the comparison and (when fitted) the residual periodogram anew. */
  async function refreshAround(starId: number, fitted: boolean) {
    residuals.data = null
    await Promise.all([
      track(models, () => api.listModels(starId)),
      track(compare, () => api.compareModels(starId)),
      fitted ? runResiduals() : Promise.resolve(null),
    ])
  }

  /** Counts an activity candidate of the search as a planet (a new fitted version, with who and why in its note). */
  async function overrule(modelId: number, signal: number, reason: string) {
    return showChanged(await track(fitting, () => api.overruleSignal(modelId, { signal, reason })))
  }

  /** "Planets + GP": the model's planets with a GP noise model (P_rot from the strongest indicator peak), fitted as a new model. */
  async function gpVariant(modelId: number) {
    return showChanged(await track(fitting, () => api.gpVariant(modelId)))
  }

  const versionLoad = asyncState<ModelVersion>()
  /** Puts the spec of an older version of the selected model into the form (a fit then adds a new version). */
  async function loadVersion(modelId: number, version: number) {
    const v = await track(versionLoad, () => api.fetchModelVersion(modelId, version))
    if (v) {
      form.value = specToForm(v.name, v.spec, instruments)
      formModelId.value = modelId
    }
  }

  async function duplicate(modelId: number) {
    const copy = await track(fitting, () => api.duplicateModel(modelId))
    if (copy) {
      await track(models, () => api.listModels(need()))
      await selectModel(copy.id)
    }
  }

  async function archive(modelId: number) {
    const archiving = asyncState<void>()
    await track(archiving, () => api.archiveModel(modelId))
    if (archiving.error) { fitting.error = archiving.error; return }
    if (selected.data?.id === modelId) { selected.data = null; residuals.data = null; newModel() }
    const id = need()
    await Promise.all([track(models, () => api.listModels(id)), track(compare, () => api.compareModels(id))])
  }

  /** Every computed power of a stored run (the plot copy is what `rv`/`residuals` hold); may be refused when dropped. */
  const fullCurve = (runId: number) => fetchPeriodogramFull(runId)

  return {
    fullCurve, rv, residuals, indicators, settings, searchSettings, models, selected, fitting, compare, search, form, formModelId, fitStartedAt,
    versionLoad, fitted, rotationSuggestion, overrule, gpVariant, load, loadVersion, runRv, runIndicator, runResiduals, addPlanet, newModel, selectModel, fit, runSearch, duplicate, archive,
  }
})
