import { defineStore } from 'pinia'
import { listModels } from '@/api/analyses.ts'
import { listLimits } from '@/api/limits.ts'
import { fetchTeam } from '@/api/teams.ts'
import type { ModelSummary } from '@shared/api/analyses.ts'
import type { LimitsRun } from '@shared/api/limits.ts'
import type { TeamDetail } from '@shared/api/teams.ts'
import { asyncState, track } from './async-state.ts'

/**
 * What a report can be made from and shared with: the star's models and detection-limit runs (for
 * freezing) and the team's members (for sharing), each with its error for the screen.
 */
export const useReportSourcesStore = defineStore('report-sources', () => {
  const models = asyncState<ModelSummary[]>([])
  const limitRuns = asyncState<LimitsRun[]>([])
  const team = asyncState<TeamDetail>()

  async function load(starId: number) {
    await Promise.all([track(models, () => listModels(starId)), track(limitRuns, () => listLimits(starId))])
  }
  async function loadTeam(teamId: number) {
    if (team.data?.id === teamId) return team.data
    return track(team, () => fetchTeam(teamId))
  }
  return { models, limitRuns, team, load, loadTeam }
})
