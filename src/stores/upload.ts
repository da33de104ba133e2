import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import * as api from '@/api/uploads.ts'
import type { CommitOptions, CommitProblem, CommitResponse, FilePreview, PreviewResponse, TableMapping } from '@/api/types.ts'
import { asyncState, track } from './async-state.ts'

/**
 * The "add data" wizard's state: the chosen files, what the server detected in each, the user's
 * corrections (one mapping per file name), and the outcome of the final save.
 */
export const useUploadStore = defineStore('upload', () => {
  const starId = ref<number | null>(null)
  const files = ref<File[]>([])
  const preview = asyncState<PreviewResponse>()
  const mappings = ref<Record<string, TableMapping>>({})
  /** Choices for the save: rows already stored (skip / keep / cancel), skip problem rows, the observatory. */
  const options = ref<CommitOptions>({ overlap: 'cancel', skipProblemRows: false })
  const commit = asyncState<CommitResponse>()

  const previews = computed<FilePreview[]>(() => preview.data?.files ?? [])
  const totalProblems = computed(() => previews.value.reduce((n, f) => n + f.problemCount, 0))
  const totalRows = computed(() => previews.value.reduce((n, f) => n + f.rowCount, 0))
  const totalOverlap = computed(() => previews.value.reduce((n, f) => n + (f.overlap?.count ?? 0), 0))
  /** Row problems the server listed when a save was refused. */
  const commitProblems = computed<CommitProblem[]>(() => {
    const details = commit.apiError?.details as { problems?: CommitProblem[] } | undefined
    return details?.problems ?? []
  })

  function reset(forStar: number) {
    starId.value = forStar
    files.value = []
    preview.data = null
    preview.error = null
    mappings.value = {}
    options.value = { overlap: 'cancel', skipProblemRows: false }
    commit.data = null
    commit.error = null
    commit.apiError = null
  }

  function setFiles(chosen: File[]) {
    files.value = chosen
    preview.data = null
    preview.error = null
    mappings.value = {}
  }

  /** The mapping each file was read with (the detected one first, then the user's as sent). */
  function adopt(result: PreviewResponse | null) {
    if (!result) return
    const next: Record<string, TableMapping> = {}
    for (const file of result.files) next[file.fileName] = plainCopy(file.mapping)
    mappings.value = next
  }

  /** First look at the files: the server guesses each one's layout. */
  async function detect() {
    if (starId.value === null) throw new Error('upload store: starId is not set (call reset first)')
    const id = starId.value
    adopt(await track(preview, () => api.previewUpload(id, files.value)))
  }

  /** Reads the files again with the user's corrected mappings, exactly as they stand. */
  async function recheck() {
    if (starId.value === null) throw new Error('upload store: starId is not set (call reset first)')
    const id = starId.value
    const edited = plainCopy(mappings.value)
    adopt(await track(preview, () => api.previewUpload(id, files.value, undefined, edited)))
  }

  async function save() {
    if (starId.value === null) throw new Error('upload store: starId is not set (call reset first)')
    const id = starId.value
    return track(commit, () => api.commitUpload(id, files.value, plainCopy(mappings.value), plainCopy(options.value)))
  }

  return {
    starId, files, preview, mappings, options, commit, previews, totalProblems, totalRows, totalOverlap, commitProblems,
    reset, setFiles, detect, recheck, save,
  }
})

/** Deep plain copy of reactive data (structuredClone refuses proxies). */
function plainCopy<T>(value: T): T {
  return JSON.parse(JSON.stringify(value)) as T
}
