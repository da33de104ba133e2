import { defineStore } from 'pinia'
import { ref } from 'vue'
import * as api from '@/api/reports.ts'
import type { FreezeRequest, ReportDetail, ReportSummary, ReportVersion, Review, ReviewRequest, Share, ShareRequest } from '@shared/api/reports.ts'
import { asyncState, track } from './async-state.ts'

/** Reports: a star's list, the report on screen with the version shown, freezing, sharing and reviewing. */
export const useReportsStore = defineStore('reports', () => {
  const list = asyncState<ReportSummary[]>([])
  const report = asyncState<ReportDetail>()
  const version = asyncState<ReportVersion>()
  const freezing = asyncState<ReportDetail & { created: boolean }>()
  const sharing = asyncState<Share>()
  const reviewing = asyncState<Review>()
  const shownVersion = ref<number | null>(null)

  const loadList = (starId: number) => track(list, () => api.listReports(starId))

  async function load(reportId: number, v?: number) {
    const d = await track(report, () => api.fetchReport(reportId))
    if (!d) return
    await show(v ?? d.currentVersion)
  }
  async function show(v: number) {
    if (!report.data) return
    shownVersion.value = v
    await track(version, () => api.fetchReportVersion(report.data!.id, v))
  }
  async function freeze(modelId: number, body: FreezeRequest = {}) {
    return track(freezing, () => api.freezeReport(modelId, body))
  }
  async function share(body: ShareRequest) {
    if (!report.data) return null
    const out = await track(sharing, () => api.shareReport(report.data!.id, body))
    if (out) await track(report, () => api.fetchReport(report.data!.id))
    return out
  }
  async function review(body: ReviewRequest) {
    if (!report.data) return null
    const out = await track(reviewing, () => api.reviewReport(report.data!.id, body))
    if (out) await track(report, () => api.fetchReport(report.data!.id))
    return out
  }
  return { list, report, version, freezing, sharing, reviewing, shownVersion, loadList, load, show, freeze, share, review }
})
